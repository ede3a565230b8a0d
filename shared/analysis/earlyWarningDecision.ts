// The alarm-worthy criterion of one evaluation, shared by the live task, replays and the
// benchmarks. Slowing down is judged on recovery-rate evidence (docs/science.md §S3.2): the
// stability-trend test says the AR(1) coefficient is rising (recovery slowing), and the variance
// must not be falling, as both rise together near a fold (Ditlevsen & Johnsen 2010, GRL
// 37:L19703). A variance rise on its own is "noise level changed", never slowing down. The rule's
// on-delay and off-delay (ISA-18.2-style hysteresis, docs/science.md §S7.3) then act on these verdicts.
import { normalUpperTail } from './normal'
import type { StabilityTrendTest } from './stabilityTrend'

export type TrendEvidence = 'slowing down' | 'noise level changed' | 'no trend'

export interface VarianceChange {
  /** ln(mean square of the later half / of the earlier half) about the window mean. */
  logRatio: number
  /** One-sided p for a rise. */
  p: number
}

/**
 * Compares the variance of the window's two halves. For an AR(1) with coefficient φ, the log of a
 * sample variance over m values has variance ≈ 2(1 + φ²)/((1 − φ²)·m) (Bartlett's large-sample
 * formula [from memory]), so the difference of two halves is referred to a normal with twice that.
 */
export function varianceChange(values: ArrayLike<number>, phi: number): VarianceChange {
  const n = values.length
  const half = Math.floor(n / 2)
  let mean = 0
  for (let i = 0; i < n; i++) mean += values[i]!
  mean /= n
  let early = 0, late = 0
  for (let i = 0; i < half; i++) early += (values[i]! - mean) ** 2
  for (let i = n - half; i < n; i++) late += (values[i]! - mean) ** 2
  if (!(early > 0) || !(late > 0)) return { logRatio: Number.NaN, p: 1 }
  const logRatio = Math.log(late / early)
  const f = Math.min(Math.abs(Number.isFinite(phi) ? phi : 0), 0.99)
  const sd = Math.sqrt(2 * 2 * (1 + f * f) / ((1 - f * f) * half))
  return { logRatio, p: normalUpperTail(logRatio / sd) }
}

/**
 * What one evaluation's tests say. `confirmed` false: a slowing-down look still awaits its
 * confirmation (evaluateRecord.ts confirmedEvidence), and the verdict is what the rest says.
 */
export function judgeEvidence(stability: StabilityTrendTest, variance: VarianceChange, alpha: number, confirmed = true): TrendEvidence {
  if (confirmed && stability.p <= alpha && stability.fit.slope > 0 && variance.logRatio > 0) return 'slowing down'
  if (variance.p <= alpha) return 'noise level changed'
  return 'no trend'
}
