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
    // Does not bind in practice: every null or approach evaluation with p ≤ 0.01 had τ ≥ 0.7
    // (detection study); kept as a floor for tags given fewer surrogates.
    minTau: 0.3,
  }
}

/** Seconds between two evaluations of a tag's trend tests. */
export const evaluationIntervalS = (settings: Pick<IndicatorSettings, 'evaluateEvery'>, samplePeriodS: number) =>
  settings.evaluateEvery * samplePeriodS

/** A slowing-down or fold-in-view rule's delays, counted in evaluations of the trend tests. */
export interface EvaluationDelays {
  onDelayEvaluations: number
  offDelayEvaluations: number
}

/**
 * The slowing-down alert raises only after the evidence has held at 4 consecutive evaluations
 * (on-delay 3 evaluation intervals). Each single test is calibrated (p ≤ 0.01 on 1.2% of 1,232
 * steady-unit evaluations), but a tag is re-tested 168 times a week on overlapping data (SCIENCE.md
 * A5 item 12). Whole-procedure study (scripts/bench/detection.ts, 60 s samples, 28 steady-unit and
 * 36 OU-null tag-weeks): on-delay 1 gave 10 steady + 7 OU false alerts (0.27 per tag-week); on-delay
 * 2 gave 3 + 1; on-delay 3 gave 1 + 0 (0.016 per tag-week); on-delay 4 gave 0 but detected the
 * demo bus in 6/8 runs with a 5 min median lead against 7 min. Null streaks of evidence rarely
 * reach 4 because the 900-sample trend window moves on by 60 samples per evaluation, while a real
 * approach keeps the evidence. α below 0.01 would need several times more surrogates per tick.
 */
export const EARLY_WARNING_DELAYS: EvaluationDelays = { onDelayEvaluations: 3, offDelayEvaluations: 4 }
export const FOLD_IN_VIEW_DELAYS: EvaluationDelays = { onDelayEvaluations: 1, offDelayEvaluations: 3 }
