// Starting indicator settings for a tag, from its sample period Δ alone (engineers tune them per
// tag afterwards). Windows are counted in samples, so they scale with Δ.
export interface IndicatorSettings {
  windowSamples: number
  detrendBandwidthS: number
  trendWindowSamples: number
  indicatorStep: number
  evaluateEvery: number
  surrogates: number
  alpha: number
  minTau: number
}

export function defaultIndicatorSettings(samplePeriodS: number): IndicatorSettings {
  if (!(samplePeriodS > 0)) throw new RangeError(`sample period must be positive, got ${samplePeriodS}`)
  return {
    // SE(r₁) ≈ √((1 − φ²)/n) (SCIENCE.md A2): 300 samples keep it under 0.06.
    windowSamples: 300,
    // Wide against the fluctuations measured, so the smoother does not absorb them (A3 step 1).
    detrendBandwidthS: 100 * samplePeriodS,
    // Three windows: enough indicator points for Kendall's τ while staying recent.
    trendWindowSamples: 900,
    indicatorStep: 10,
    evaluateEvery: 60,
    // 99 surrogates resolve p down to 0.01 = (1 + 0)/(99 + 1) (Davison & Hinkley 1997 [from memory]).
    surrogates: 99,
    alpha: 0.01,
    minTau: 0.3,
  }
}

/** Seconds between two evaluations of a tag's trend tests. */
export const evaluationIntervalS = (settings: Pick<IndicatorSettings, 'evaluateEvery'>, samplePeriodS: number) =>
  settings.evaluateEvery * samplePeriodS
