// Replays tag rules over stored or simulated samples and evaluation points exactly as the live
// task does (docs/science.md §S7.3): value rules see every good sample, the other measures each
// evaluation point, in time order, through the on-/off-delay condition tracker. The live tick
// (server/services/pipeline/tagProcessing.ts) feeds the same observations to its stored alarms;
// the replay job and the detection study count what the rules would have raised.
import { INACTIVE, stepCondition, type ConditionSettings, type ConditionState } from '../alarms/conditionTracker'
import type { TagMeasure } from '../alarms/vocabulary'
import { QUALITY_CODES } from '../utils/sampleQuality'
import type { EvaluationPoint } from './evaluateRecord'
import { measureOf } from './ruleMeasure'

/** Times (s) at which the rule would have raised (replayConditions over the points alone). */
export function ruleActivations(points: readonly EvaluationPoint[], measure: Exclude<TagMeasure, 'value'>, condition: ConditionSettings): number[] {
  const observations = points.map(point => ({ rule: 0, time: point.time, value: measureOf(point, measure), current: point }))
  return replayConditions([condition], [INACTIVE], observations).filter(c => c.change === 'activate').map(c => c.time)
}

/** One observation for one rule: `rule` indexes the measures passed in. */
export interface RuleObservation {
  rule: number
  time: number
  value: number
  /** The newest evaluation at this moment (what an alarm raised now would describe). */
  current: EvaluationPoint | null
}

/**
 * The observations a tick's new samples [firstNew, end) and their evaluation points give a tag's
 * rules, in the live order: each good sample to the value rules, then every point up to that
 * sample to the others. `qualities` are the samples' stored codes: an uncertain sample still
 * counts in the indicator windows (docs/science.md §S2.1) but is no observation for a value rule,
 * so instrument trouble never raises or clears a limit alarm (the loaders already leave bad ones
 * out). `previous` is the newest evaluation before these samples.
 */
export function* tagObservations(
  times: ArrayLike<number>, values: ArrayLike<number>, qualities: ArrayLike<number>, firstNew: number,
  points: readonly EvaluationPoint[], measures: readonly TagMeasure[], previous: EvaluationPoint | null,
): Generator<RuleObservation> {
  let next = 0
  let current = previous
  for (let i = firstNew; i < times.length; i++) {
    if (qualities[i] === QUALITY_CODES.good) {
      for (let r = 0; r < measures.length; r++) {
        if (measures[r] === 'value') yield { rule: r, time: times[i]!, value: values[i]!, current }
      }
    }
    while (next < points.length && points[next]!.time <= times[i]!) {
      current = points[next++]!
      for (let r = 0; r < measures.length; r++) {
        const measure = measures[r]!
        if (measure !== 'value') yield { rule: r, time: current.time, value: measureOf(current, measure), current }
      }
    }
  }
}

export interface ConditionChange {
  rule: number
  time: number
  value: number
  change: 'activate' | 'return'
}

/** Steps each rule's condition through the observations; `states` carry over between calls. */
export function replayConditions(
  conditions: readonly ConditionSettings[], states: ConditionState[], observations: Iterable<RuleObservation>,
): ConditionChange[] {
  const changes: ConditionChange[] = []
  for (const o of observations) {
    const step = stepCondition(conditions[o.rule]!, states[o.rule]!, o.time, o.value)
    states[o.rule] = step.state
    if (step.change) changes.push({ rule: o.rule, time: o.time, value: o.value, change: step.change })
  }
  return changes
}
