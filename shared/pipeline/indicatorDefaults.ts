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
 * bootstrap grows with them). Evaluated every 20 samples; α 0.0025 per look while the window grows
 * (those looks are nested, but each adds a chance, so the records alerted grow with their length:
 * numbers beside EARLY_WARNING_DELAYS), then the false-alert budget below.
 */
const TREND_WINDOW_SAMPLES = 1200
const MIN_TREND_SAMPLES = 200
const EVALUATE_EVERY = 20
const ALPHA = 0.0025

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
    // α of a look while the trend window grows; once it slides, slidingLookAlpha (never above it).
    alpha: ALPHA,
  }
}

/** Whether a trend window of this many usable samples is still growing (its looks are nested). */
export const trendWindowGrowing = (settings: Pick<IndicatorSettings, 'trendWindowSamples'>, trendSamples: number) =>
  trendSamples < settings.trendWindowSamples

/** Seconds between two evaluations of a tag's trend tests. */
export const evaluationIntervalS = (settings: Pick<IndicatorSettings, 'evaluateEvery'>, samplePeriodS: number) =>
  settings.evaluateEvery * samplePeriodS

/** A slowing-down or fold-in-view rule's delays, counted in evaluations of the trend tests. */
export interface EvaluationDelays {
  onDelayEvaluations: number
  offDelayEvaluations: number
}

/**
 * The slowing-down alert raises on the first evaluation that says "slowing down" (no on-delay of
 * its own): once the trend window slides, the engine already asks for two looks in a row
 * (evaluateRecord.ts confirmedEvidence), and while it grows one look suffices. A tag is re-tested
 * every 20 samples on overlapping data for as long as it runs (docs/science.md §S8.2), so the
 * looks' α and the delays were set on whole records by scripts/calibrateEarlyWarning.ts (the
 * detection study's simulations, seeds the benchmark does not score). On 100 records of 500
 * samples per set, α 0.004 alerted 37/100 harvesting and 28/100 lake approaches with the worst of
 * 13 null kinds at 4/100. Scored on 300 records of 900 samples per set (SAMPLES=900, nulls also on
 * their first 460, 600 and 750 samples), the nulls' share grew with the length, and at 0.004 five
 * kinds passed 5 % by 900 samples, so the growing look now spends less:
 *   α while growing  harvesting fold  lake fold  worst null at 900 (plain / drifting mean)
 *   0.004            264/300          195/300    20/300 lake null  /  33/300 accelerating drift
 *   0.003            257/300          184/300    15/300 white noise / 26/300 accelerating drift
 *   0.0025 chosen    251/300          177/300    14/300 lake null  /  23/300 accelerating drift, slow sine
 * (transcritical 300/300 at each; on 150 fresh 500-sample records 0.0025 alerted 55, 33 and 129 of
 * 150 with the worst null 5/150, 0.004 alerted 63, 37 and 133 with 9/150). The two drifting-mean nulls stay above 5 % at 900 samples: the
 * window's kernel smooth lags a mean that bends near the window's end, which reads as slowing down
 * (docs/science.md §S8.2). Records that stop far from the fold are still missed
 * (scripts/bench/earlyWarning.ts lists them). The
 * off-delay keeps a raised alert through a few weaker evaluations.
 */
export const EARLY_WARNING_DELAYS: EvaluationDelays = { onDelayEvaluations: 0, offDelayEvaluations: 4 }
export const FOLD_IN_VIEW_DELAYS: EvaluationDelays = { onDelayEvaluations: 1, offDelayEvaluations: 3 }

const DAY_S = 86_400
/**
 * False slowing-down alerts a sliding trend window raises per unit of look α, per trend window's
 * worth of data, overlapping looks and the two-look confirmation included, for the worst null kind:
 * 3–24 per null kind at α 0.003–0.01 on the long null streams of scripts/calibrateEarlyWarning.ts
 * (4 streams of 10,000 samples per kind, 364 windows), the most for AR(1) φ 0.9. Sized for that
 * one, as slow-memory loops are common in plants, rather than for the average (10).
 */
export const FALSE_ALERTS_PER_WINDOW_PER_ALPHA = 25

/**
 * The false slowing-down alerts one tag may raise per day on data that hold no approach: 20 per
 * 1,000 tag-days, so a 1,000-tag plant sees about 20 advisory alerts a day it would rather not,
 * counted apart from its alarms (docs/science.md §S8.3), whatever the tags' sample periods.
 */
export const FALSE_ALERT_BUDGET_PER_TAG_DAY = 0.02

/**
 * α of one look once the trend window slides. A tag re-tested every few samples for weeks takes a
 * new chance with every trend window's worth of data, so a fixed α would make a 1 s tag raise 60
 * times the false alerts of a 60 s one. Spending a budget per tag-day gives every tag the same
 * expected rate: at 1 s α ≈ 1.1e-5, at 5 s ≈ 5.6e-5, at 60 s ≈ 6.7e-4 (never above the tag's α).
 */
export function slidingLookAlpha(
  settings: Pick<IndicatorSettings, 'trendWindowSamples' | 'alpha'>,
  samplePeriodS: number,
  budgetPerTagDay = FALSE_ALERT_BUDGET_PER_TAG_DAY,
): number {
  const windowsPerDay = DAY_S / (settings.trendWindowSamples * samplePeriodS)
  return Math.min(settings.alpha, budgetPerTagDay / (windowsPerDay * FALSE_ALERTS_PER_WINDOW_PER_ALPHA))
}
