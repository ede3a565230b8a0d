// Window indicators (docs/science.md §S2.4) from centred sums; shared by the exact and live paths.
import type { CentredSums, Indicators, RecoveryRate } from './types'

/** Context a window's sums do not carry. */
export interface IndicatorContext {
  /** Mean sample spacing of the window, seconds. */
  dt: number
  /** Mean of the raw (not detrended) level over the window, for the coefficient of variation. */
  levelMean: number
}

/**
 * Variance (n − 1), SD, CV, NIST lag-1 autocorrelation, recovery rate, g₁ skewness and b₂
 * kurtosis from centred sums (definitions in docs/science.md §S2.4).
 */
export function indicatorsFromSums(sums: CentredSums, context: IndicatorContext): Indicators {
  const { n, sum2, sum3, sum4, lagSum } = sums
  const variance = n > 1 ? sum2 / (n - 1) : Number.NaN
  const sd = Math.sqrt(variance)
  const flat = !(sum2 > 0)
  const m2 = sum2 / n
  const ar1 = flat ? Number.NaN : lagSum / sum2
  const kurtosis = flat ? Number.NaN : (sum4 / n) / (m2 * m2)
  return {
    n,
    dt: context.dt,
    variance,
    sd,
    // CV pairs the fluctuation size (residual SD) with the raw level: the residual mean is ≈ 0.
    cv: context.levelMean === 0 ? null : sd / Math.abs(context.levelMean),
    ar1,
    recovery: recoveryRate(ar1, context.dt, n),
    skewness: flat ? Number.NaN : (sum3 / n) / Math.pow(m2, 1.5),
    kurtosis,
    excessKurtosis: kurtosis - 3,
  }
}

/** Fewer points than this leaves r₁ meaningless (its SE ≈ 1/√n exceeds 0.3). */
export const MIN_SAMPLES_FOR_RECOVERY = 10

/** k = −ln(AR1)/Δt (docs/science.md §S2.3), or the reason it is not defined. */
export function recoveryRate(ar1: number, dt: number, n: number): RecoveryRate {
  if (n < MIN_SAMPLES_FOR_RECOVERY) {
    return { status: 'too short', reason: `${n} samples, need ${MIN_SAMPLES_FOR_RECOVERY}` }
  }
  if (!(dt > 0)) return { status: 'too short', reason: 'window spans no time' }
  if (Number.isNaN(ar1)) return { status: 'flat', reason: 'no variation in the window' }
  if (ar1 <= 0) return { status: 'not slowing-down compatible', reason: 'ar1 ≤ 0' }
  if (ar1 >= 1) return { status: 'not slowing-down compatible', reason: 'ar1 ≥ 1' }
  return { status: 'ok', rate: -Math.log(ar1) / dt }
}
