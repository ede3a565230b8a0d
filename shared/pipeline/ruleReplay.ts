// Replays one tag rule over stored or simulated evaluation points exactly as the live task does:
// the rule's measure of each point through the on-/off-delay condition tracker (docs/science.md §S7.3).
// The detection study and its tests use it to count what the live alarm would have raised.
import { INACTIVE, stepCondition, type ConditionSettings } from '../alarms/conditionTracker'
import type { TagMeasure } from '../alarms/vocabulary'
import type { EvaluationPoint } from './evaluateRecord'
import { measureOf } from './ruleMeasure'

/** Times (s) at which the rule would have raised. */
export function ruleActivations(points: readonly EvaluationPoint[], measure: Exclude<TagMeasure, 'value'>, condition: ConditionSettings): number[] {
  let state = INACTIVE
  const raised: number[] = []
  for (const point of points) {
    const step = stepCondition(condition, state, point.time, measureOf(point, measure))
    state = step.state
    if (step.change === 'activate') raised.push(point.time)
  }
  return raised
}
