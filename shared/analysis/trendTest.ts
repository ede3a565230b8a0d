// Is an indicator's trend more than a stationary series would give? Kendall's τ of the rolling
// indicator against time, judged against the same pipeline run on surrogate series (docs/science.md §S3.4
// and §S3.5). τ's own normal p-value is not used: overlapping windows make the indicator series
// strongly autocorrelated and that p-value far too small.
import { forEachFullWindow } from './indicatorSeries'
import { forEachCountWindow } from './windowTracks'
import type { SeriesOptions } from './indicatorSeries'
import { trendTau } from './kendall'
import type { Rng } from './random'
import { surrogateGenerator } from './surrogates'
import type { SurrogateKind } from './surrogates'
import type { Indicators } from './types'

/**
 * Indicators whose trend can be tested. A rising AR1 is the falling recovery rate: with a constant
 * Δt, k = −ln(AR1)/Δt is a decreasing function of AR1, so their τ differ only in sign, and AR1
 * stays defined where k is not (AR1 ≤ 0).
 */
export type TrendIndicator = 'ar1' | 'variance' | 'skewness' | 'kurtosis'

export interface TrendTestOptions {
  window: SeriesOptions['window']
  step?: number
  surrogates: number
  kind: SurrogateKind
  indicators: readonly TrendIndicator[]
}

export interface TrendTestResult {
  tau: number
  /** Monte-Carlo p = (1 + #{τ* ≥ τ})/(N + 1) for a rising trend (Davison & Hinkley 1997). */
  p: number
  exceedances: number
  surrogates: number
}

/** τ of each indicator's rolling series and its surrogate p-value; one surrogate serves all indicators. */
export function surrogateTrendTest(
  times: ArrayLike<number>, residuals: ArrayLike<number>, options: TrendTestOptions, rng: Rng,
): Record<TrendIndicator, TrendTestResult | undefined> {
  const observed = indicatorTaus(times, residuals, options)
  const exceedances = options.indicators.map(() => 0)
  const generate = surrogateGenerator(options.kind, residuals)
  for (let s = 0; s < options.surrogates; s++) {
    const taus = indicatorTaus(times, generate(rng), options)
    // A NaN τ (a flat surrogate) can never count as at least as extreme.
    taus.forEach((tau, k) => { if (tau >= observed[k]!) exceedances[k]!++ })
  }
  const result: Record<TrendIndicator, TrendTestResult | undefined> = {
    ar1: undefined, variance: undefined, skewness: undefined, kurtosis: undefined,
  }
  options.indicators.forEach((name, k) => {
    result[name] = {
      tau: observed[k]!,
      p: (1 + exceedances[k]!) / (options.surrogates + 1),
      exceedances: exceedances[k]!,
      surrogates: options.surrogates,
    }
  })
  return result
}

/** Kendall τ against time of each requested indicator's rolling series. */
export function indicatorTaus(times: ArrayLike<number>, residuals: ArrayLike<number>, options: TrendTestOptions): number[] {
  const tracks = options.indicators.map(() => [] as number[])
  const record = (values: Indicators): void => {
    options.indicators.forEach((name, k) => tracks[k]!.push(pick(values, name)))
  }
  // Count windows take the prefix-sum path (a window every `step` samples, the same windows the
  // rolling path would visit); duration windows need the rolling window's time bookkeeping.
  if (options.window.kind === 'count') forEachCountWindow(times, residuals, options.window.samples, options.step ?? 1, record)
  else forEachFullWindow(times, residuals, { window: options.window, step: options.step }, record)
  return tracks.map(track => (track.length >= 2 ? trendTau(track) : Number.NaN))
}

function pick(values: Indicators, name: TrendIndicator): number {
  switch (name) {
    case 'ar1': return values.ar1
    case 'variance': return values.variance
    case 'skewness': return values.skewness
    case 'kurtosis': return values.kurtosis
  }
}
