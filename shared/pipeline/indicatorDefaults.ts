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
 * bootstrap grows with them). Evaluated every 20 samples at α 0.01, with the rule's on-delay of one
 * evaluation (two verdicts in a row). Chosen by the whole-procedure study in
 * scripts/calibrateEarlyWarning.ts over 60 seeds per kind (numbers beside EARLY_WARNING_DELAYS).
 */
const TREND_WINDOW_SAMPLES = 1200
const MIN_TREND_SAMPLES = 200
const EVALUATE_EVERY = 20
const ALPHA = 0.01

export function defaultIndicatorSettings(samplePeriodS: number): IndicatorSettings {
  if (!(samplePeriodS > 0)) throw new RangeError(`sample period must be positive, got ${samplePeriodS}`)
  return {
    // SE(r₁) ≈ √((1 − φ²)/n) (SCIENCE.md A2): 300 samples keep it under 0.06.
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
    // 99 surrogates resolve p down to 0.01 = (1 + 0)/(99 + 1) (Davison & Hinkley 1997 [from memory]).
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
 * say "slowing down". Each look is a test at α 0.01, but a tag is re-tested every 20 samples on
 * overlapping data (SCIENCE.md A5 item 12), so α and the on-delay were set on whole records.
 * Study (scripts/calibrateEarlyWarning.ts, SEEDS=150: 500-sample records) — records alerted:
 *   α 0.01, on-delay 1 (chosen): harvesting fold 42/150; nulls ≤ 5% each: harvesting at fixed h 3,
 *     AR(1) φ 0.3/0.6/0.9 2/3/6, noise step ×2 2, linear drift 4, accelerating 3, slow sine 1,
 *     added white noise 7
 *   α 0.02, on-delay 1: fold 51/150, but nulls up to 10/150 (white noise), 9/150 (AR(1))
 *   α 0.05, on-delay 2: fold 58/150, nulls up to 14/150
 * Detection power on short records is the open problem: records that stop far from the fold are
 * missed (scripts/bench/earlyWarning.ts lists them). The off-delay keeps a raised alert through a
 * few weaker evaluations.
 */
export const EARLY_WARNING_DELAYS: EvaluationDelays = { onDelayEvaluations: 1, offDelayEvaluations: 4 }
export const FOLD_IN_VIEW_DELAYS: EvaluationDelays = { onDelayEvaluations: 1, offDelayEvaluations: 3 }
