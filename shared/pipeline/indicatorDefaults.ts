// Starting indicator settings for a tag, from its sample period Δ alone (engineers tune them per
// tag afterwards). Windows are counted in samples, so they scale with Δ.
export interface IndicatorSettings {
  windowSamples: number
  detrendBandwidthS: number
  /** Largest trend window; the window grows to it from `minTrendSamples`. */
  trendWindowSamples: number
  /** Usable samples (after warm-up) before a tag's first early-warning judgement. */
  minTrendSamples: number
  indicatorStep: number
  evaluateEvery: number
  surrogates: number
  alpha: number
}

/**
 * The trend window expands from 200 usable samples (a judgement within a few hundred samples of a
 * start, a step or a new tag) to 1,200 (longer windows add power on slow approaches; the cost of a
 * bootstrap grows with them). Evaluated every 20 samples at α 0.001, with the rule's on-delay of one
 * evaluation (two verdicts in a row). Chosen by the whole-procedure study in
 * scripts/calibrateEarlyWarning.ts (numbers beside EARLY_WARNING_DELAYS).
 */
const TREND_WINDOW_SAMPLES = 1200
const MIN_TREND_SAMPLES = 200
const EVALUATE_EVERY = 20
const ALPHA = 0.001

export function defaultIndicatorSettings(samplePeriodS: number): IndicatorSettings {
  if (!(samplePeriodS > 0)) throw new RangeError(`sample period must be positive, got ${samplePeriodS}`)
  return {
    // SE(r₁) ≈ √((1 − φ²)/n) (docs/science.md §S2.3): 300 samples keep it under 0.06.
    windowSamples: 300,
    // Wide against the fluctuations measured, so the smoother does not absorb them (A3 step 1),
    // narrow enough that a mean curving over a few hundred samples leaves little behind (a 100-
    // sample bandwidth left a slow sine drift flagged on most seeds). Also the warm-up discarded
    // after a start or a step.
    detrendBandwidthS: 50 * samplePeriodS,
    trendWindowSamples: TREND_WINDOW_SAMPLES,
    minTrendSamples: MIN_TREND_SAMPLES,
    indicatorStep: 10,
    evaluateEvery: EVALUATE_EVERY,
    // 99 bootstrap series fix the mean and SD of the null distribution the p is read from.
    surrogates: 99,
    alpha: ALPHA,
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
 * The slowing-down alert raises when two evaluations in a row (on-delay one evaluation interval)
 * say "slowing down". A tag is re-tested every 20 samples on overlapping data for as long as it
 * runs (docs/science.md §S8.2), so α per look and the on-delay were set on whole records, short
 * ones and week-long streams alike. Study (scripts/calibrateEarlyWarning.ts; short: SEEDS=150,
 * 500 samples; long: N=10080 SEEDS=12 ONLY="AR(1) φ 0.9", a week at 60 s) — records alerted:
 *   α      on-delay  harvesting fold  worst short null          long AR(1) φ 0.9 streams
 *   0.01   1         42/150           7/150 (white noise)       7/12   (p from the Monte-Carlo count)
 *   0.005  2         17/150           4/150 (white noise)       4/12
 *   0.002  0         38/150           5/150 (AR(1), white)      6/12
 *   0.002  1         21/150           3/150 (white noise)       2/12
 *   0.001  1 chosen  11/150           2/150 (white noise)       1/12
 * The week-long streams set the per-look α: at 0.01 most null tag-weeks raised a false alert. On
 * the demo's steady unit (scripts/bench/detection.ts steadyUnitNulls, seeds 1–12, 24 tag-weeks at
 * 60 s) α 0.002 raised 5 false alerts and α 0.001 raised 1 (0.04 per tag-week).
 * While the trend window still grows, looks are nested and the look's α is 5 × 0.001
 * (evaluateRecord EXPANDING_ALPHA_FACTOR): short records then alert on the harvesting fold in
 * 33/150 (11/150 without the factor), every short null ≤ 6/150 (white noise; AR(1) φ 0.9 5/150),
 * week-long AR(1) φ 0.9 streams 1/12, the steady unit still 1 in 24 tag-weeks.
 * Detection power on short records is the open problem: records that stop far from the fold are
 * missed (scripts/bench/earlyWarning.ts lists them). The off-delay keeps a raised alert through a
 * few weaker evaluations.
 */
export const EARLY_WARNING_DELAYS: EvaluationDelays = { onDelayEvaluations: 1, offDelayEvaluations: 4 }
export const FOLD_IN_VIEW_DELAYS: EvaluationDelays = { onDelayEvaluations: 1, offDelayEvaluations: 3 }
