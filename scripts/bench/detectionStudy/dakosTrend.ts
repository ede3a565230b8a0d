// The standard published early-warning pipeline (Dakos et al. 2012, PLoS ONE 7:e41010, the
// procedure of the R package earlywarnings' generic_ews and surrogates_ews [from memory]),
// re-implemented as the benchmark's baseline: Gaussian-kernel detrending with a bandwidth of 10%
// of the record, a rolling window of 50% of the record moved one sample at a time, Kendall τ of
// the rolling lag-1 autocorrelation and variance against time, and a one-sided p from AR(1)
// surrogates of the residuals. Differences from the R code, all small: r₁ (NIST) in place of
// ar.ols's AR(1) coefficient, and AR(1) rather than best-AIC ARMA surrogates. Gaps are ignored,
// as generic_ews ignores them: windows count samples. The published code draws 100 surrogates by
// default [from memory]; we draw more (see study.ts), which only sharpens p.
import { gaussianSmooth, KSMOOTH_SIGMA_PER_BANDWIDTH } from '../../../shared/analysis/gaussianSmoother'
import type { Rng } from '../../../shared/analysis/random'
import { ar1SurrogateGenerator } from '../../../shared/analysis/surrogates'
import { rollingAr1AndVariance } from './rollingIndicators'
import { trendTauFast } from './trendTau'

export const DAKOS_BANDWIDTH_FRACTION = 0.1
export const DAKOS_WINDOW_FRACTION = 0.5
/** The published significance level. */
export const DAKOS_ALPHA = 0.05

export interface DakosTrend {
  tauAr1: number
  pAr1: number
  tauVariance: number
  pVariance: number
}

/**
 * Residuals after the Gaussian kernel smoother. R's ksmooth bandwidth b puts the kernel's
 * quartiles at ±b/4 (so σ = 0.37·b); earlywarnings passes b = bandwidth% of the record length.
 */
export function dakosResiduals(times: Float64Array, values: Float64Array): Float64Array {
  const span = times[times.length - 1]! - times[0]!
  const trend = gaussianSmooth(times, values, KSMOOTH_SIGMA_PER_BANDWIDTH * DAKOS_BANDWIDTH_FRACTION * span)
  return values.map((v, i) => v - trend[i]!)
}

/** Kendall τ of the rolling AR1 (and variance, unless skipped) of `residuals` against time. */
export function rollingTaus(residuals: Float64Array, withVariance = true): { ar1: number, variance: number } {
  const { ar1, variance } = rollingAr1AndVariance(residuals, Math.round(DAKOS_WINDOW_FRACTION * residuals.length))
  return { ar1: trendTauFast(ar1), variance: withVariance ? trendTauFast(variance) : Number.NaN }
}

/**
 * The whole pipeline on one record: τ of AR1 and variance with surrogate p = (1 + #τ* ≥ τ)/(N + 1).
 * The monitor, which alarms on AR1 only, skips the variance (its τ and p are then NaN).
 */
export function dakosTrendTest(times: Float64Array, values: Float64Array, surrogates: number, rng: Rng, withVariance = true): DakosTrend {
  const residuals = dakosResiduals(times, values)
  const observed = rollingTaus(residuals, withVariance)
  const generate = ar1SurrogateGenerator(residuals)
  let ar1AtLeast = 0
  let varianceAtLeast = 0
  for (let s = 0; s < surrogates; s++) {
    const taus = rollingTaus(generate(rng), withVariance)
    if (taus.ar1 >= observed.ar1) ar1AtLeast++
    if (taus.variance >= observed.variance) varianceAtLeast++
  }
  return {
    tauAr1: observed.ar1,
    pAr1: (1 + ar1AtLeast) / (surrogates + 1),
    tauVariance: observed.variance,
    pVariance: withVariance ? (1 + varianceAtLeast) / (surrogates + 1) : Number.NaN,
  }
}
