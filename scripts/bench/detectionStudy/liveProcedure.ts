// The LIVE procedure, exactly as the server runs it: scripts/bench/detection.ts `liveRun`
// (evaluateRecord with the tag's default settings, then the slowing-down rule's condition tracker
// with the demo on-/off-delays). Only read-outs are added here: whether the alert is still active
// at the end, the last point's trend score and its fold horizon.
import { INACTIVE, type ConditionSettings } from '../../../shared/alarms/conditionTracker'
import type { SampledSeries } from '../../../shared/analysis/simulate'
import type { EvaluationPoint } from '../../../shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings, EARLY_WARNING_DELAYS, evaluationIntervalS } from '../../../shared/pipeline/indicatorDefaults'
import { measureOf } from '../../../shared/pipeline/ruleMeasure'
import { replayConditions } from '../../../shared/pipeline/ruleReplay'
import { liveRun } from '../detection'

/** Every benchmark record has one sample per second. */
export const SAMPLE_PERIOD_S = 1

export interface TipProjection {
  tip: number
  low: number
  high: number
}

export interface LiveOutcome {
  /** Times the slowing-down alert raised. */
  alerts: number[]
  activeAtEnd: boolean
  /** 1 − pAr1 of the last evaluation point; null when that point has no trend test. */
  score: number | null
  fold: TipProjection | null
  evaluations: number
}

/** The slowing-down rule's condition, built as liveRun builds it. */
function slowingDownCondition(): ConditionSettings {
  const interval = evaluationIntervalS(defaultIndicatorSettings(SAMPLE_PERIOD_S), SAMPLE_PERIOD_S)
  return {
    comparison: 'above', threshold: 0.5, deadband: 0,
    onDelayS: EARLY_WARNING_DELAYS.onDelayEvaluations * interval,
    offDelayS: EARLY_WARNING_DELAYS.offDelayEvaluations * interval,
  }
}

/**
 * Replays the rule with the same tracker to learn its final state (ruleActivations reports only
 * raises), and checks its raises against liveRun's so this copy cannot drift from the live one.
 */
function finalAlertState(points: readonly EvaluationPoint[], liveAlerts: readonly number[]): boolean {
  const states = [INACTIVE]
  const observations = points.map(point => ({ rule: 0, time: point.time, value: measureOf(point, 'early_warning'), current: point }))
  const raised = replayConditions([slowingDownCondition()], states, observations).filter(c => c.change === 'activate').map(c => c.time)
  if (raised.join() !== liveAlerts.join()) throw new Error(`replay raised at ${raised.join()} but liveRun at ${liveAlerts.join()}: liveRun's rule changed`)
  return states[0]!.active
}

export function runLive(series: SampledSeries, tagId: number): LiveOutcome {
  const run = liveRun(series, SAMPLE_PERIOD_S, tagId)
  const last = run.points[run.points.length - 1]
  const fold = last?.fold.kind === 'projected'
    ? { tip: last.time + last.fold.seconds, low: last.time + last.fold.lowSeconds, high: last.time + last.fold.highSeconds }
    : null
  return {
    alerts: run.slowingDown,
    activeAtEnd: finalAlertState(run.points, run.slowingDown),
    score: last?.pAr1 == null ? null : 1 - last.pAr1,
    fold,
    evaluations: run.points.length,
  }
}
