import type { DetrendSpec, WindowSpec } from '../analysis/types'

/** What the tag's stored indicator settings (table indicator_settings) say, when it has a row. */
export interface StoredIndicatorSettings {
  windowSamples: number
  detrendBandwidthS: number
  trendWindowSamples: number
  indicatorStep: number
  surrogates: number
  alpha: number
}

export interface ChartIndicatorSettings {
  window: Extract<WindowSpec, { kind: 'count' }>
  detrend: DetrendSpec
  /** Seconds one window spans at the tag's sample period. */
  windowSeconds: number
  trendWindowSamples: number
  indicatorStep: number
  surrogates: number
  alpha: number
}

/**
 * The charts use the tag's own settings, so they show what the live pipeline judges. A tag the
 * pipeline has not seen yet gets the pipeline's starting values: 300-sample windows (SE of r₁
 * under 0.06, SCIENCE.md A2), a trend 100 sample periods wide, a 900-sample trend window, 99
 * surrogates. The causal local-linear trend is the live path's, so chart and live values agree.
 */
export function chartIndicatorSettings(samplePeriodS: number, stored?: StoredIndicatorSettings | null): ChartIndicatorSettings {
  const s = stored ?? {
    windowSamples: 300, detrendBandwidthS: 100 * samplePeriodS, trendWindowSamples: 900, indicatorStep: 10, surrogates: 99, alpha: 0.01,
  }
  return {
    window: { kind: 'count', samples: s.windowSamples },
    detrend: { kind: 'localLinear', bandwidth: s.detrendBandwidthS },
    windowSeconds: s.windowSamples * samplePeriodS,
    trendWindowSamples: s.trendWindowSamples,
    indicatorStep: s.indicatorStep,
    surrogates: s.surrogates,
    alpha: s.alpha,
  }
}
