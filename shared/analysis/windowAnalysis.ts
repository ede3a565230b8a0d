// One window of raw samples through the quality gate, detrending and indicators, and the same
// rolling along a record for the tag charts (shared/utils/tagSeries.ts). The live evaluation is
// shared/pipeline/evaluateRecord.ts, which has its own causal detrending.
import { detrend } from './detrend'
import { indicatorSeries } from './indicatorSeries'
import type { IndicatorSeries } from './indicatorSeries'
import { indicatorsFromSums } from './indicators'
import { accurateMean, centredSums } from './moments'
import { checkQuality } from './quality'
import type { DetrendSpec, Indicators, QualityLimits, QualityVerdict, WindowSpec } from './types'

export interface WindowSettings {
  detrend: DetrendSpec
  quality: QualityLimits
}

/** A window either passes the quality gate and has indicators, or fails it and has none. */
export type WindowAnalysis =
  | { quality: { ok: true }, indicators: Indicators, residuals: Float64Array }
  | { quality: Extract<QualityVerdict, { ok: false }>, indicators: null }

/**
 * Quality gate, detrending and indicators of one window of raw samples (times ascending, seconds).
 * A window that fails the gate returns `indicators: null`, so nothing downstream can alarm on it.
 */
export function analyseWindow(times: Float64Array, values: Float64Array, settings: WindowSettings): WindowAnalysis {
  const quality = checkQuality(times, values, settings.quality)
  if (!quality.ok) return { quality, indicators: null }
  const { residuals } = detrend(times, values, settings.detrend)
  const n = values.length
  const indicators = indicatorsFromSums(centredSums(residuals), {
    dt: (times[n - 1]! - times[0]!) / (n - 1),
    levelMean: accurateMean(values),
  })
  return { quality, indicators, residuals }
}

export interface RollingSettings {
  window: WindowSpec
  detrend: DetrendSpec
  /** Evaluate every `step` samples (default 1). */
  step?: number
}

/**
 * The indicator time series over a whole record (for the tag charts): the record is
 * detrended once, then a window slides over the residuals.
 */
export function rollingIndicators(times: Float64Array, values: Float64Array, settings: RollingSettings): IndicatorSeries {
  const { residuals } = detrend(times, values, settings.detrend)
  return indicatorSeries(times, residuals, { window: settings.window, step: settings.step, levels: values })
}
