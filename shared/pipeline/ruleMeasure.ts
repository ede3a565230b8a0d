// The number a rule compares with its threshold, taken from an evaluation point.
import type { TagMeasure } from '../alarms/vocabulary'
import type { EvaluationPoint } from './evaluateRecord'

/**
 * NaN means "no observation" (the gate failed, or the trend window is not full): the condition
 * tracker then neither raises nor clears. No fold in view is an infinitely distant fold.
 */
export function measureOf(point: EvaluationPoint, measure: Exclude<TagMeasure, 'value'>): number {
  const orNaN = (x: number | null) => x ?? Number.NaN
  switch (measure) {
    case 'variance': return orNaN(point.variance)
    case 'std': return orNaN(point.std)
    case 'cv': return orNaN(point.cv)
    case 'ar1': return orNaN(point.ar1)
    case 'recovery_rate': return orNaN(point.recoveryRate)
    case 'skewness': return orNaN(point.skewness)
    case 'kurtosis': return orNaN(point.kurtosis)
    case 'p_ar1': return orNaN(point.pAr1)
    case 'p_variance': return orNaN(point.pVariance)
    case 'fold_horizon':
      if (point.quality || point.evidence === null) return Number.NaN
      return point.fold.kind === 'projected' ? point.fold.seconds : Number.POSITIVE_INFINITY
    case 'early_warning':
      return point.evidence === null ? Number.NaN : point.evidence === 'slowing down' ? 1 : 0
  }
}

/** What the alarm stores about the trend and fold behind it (shown in its e-mail). */
export function alarmContext(point: EvaluationPoint | null): Record<string, unknown> {
  if (!point) return { trend: null, fold: { kind: 'none' } }
  return {
    trend: { tauAr1: point.tauAr1, pAr1: point.pAr1, tauVariance: point.tauVariance, pVariance: point.pVariance, evidence: point.evidence },
    fold: point.fold,
  }
}
