// Indicators of a sliding window over a whole record: the series whose trend is tested.
import { RollingWindow } from './rolling'
import type { Indicators, RecoveryRate, WindowSpec } from './types'

/** One value per evaluated window, as parallel arrays; `time` is the window's newest sample. */
export interface IndicatorSeries {
  time: Float64Array
  variance: Float64Array
  sd: Float64Array
  /** NaN where the raw level's mean is 0. */
  cv: Float64Array
  ar1: Float64Array
  /** NaN where `recoveryStatus` is not 'ok' (it says why). */
  recoveryRate: Float64Array
  recoveryStatus: RecoveryRate['status'][]
  skewness: Float64Array
  kurtosis: Float64Array
}

/** The numeric indicators a series carries. */
export type SeriesIndicator = 'variance' | 'sd' | 'cv' | 'ar1' | 'recoveryRate' | 'skewness' | 'kurtosis'

export interface SeriesOptions {
  window: WindowSpec
  /** Evaluate every `step` samples (1 = every sample). */
  step?: number
  /** Raw levels for the CV; defaults to the residuals themselves. */
  levels?: ArrayLike<number>
}

/**
 * Slides the window over the record, evaluating once it is full (a count window) or spans its
 * duration (a duration window), then every `step` samples. O(n) overall.
 */
export function indicatorSeries(times: ArrayLike<number>, residuals: ArrayLike<number>, options: SeriesOptions): IndicatorSeries {
  const rows: { time: number, values: Indicators }[] = []
  forEachFullWindow(times, residuals, options, (values, time) => rows.push({ time, values }))
  const column = (pick: (values: Indicators) => number): Float64Array => Float64Array.from(rows, row => pick(row.values))
  return {
    time: Float64Array.from(rows, row => row.time),
    variance: column(v => v.variance),
    sd: column(v => v.sd),
    cv: column(v => v.cv ?? Number.NaN),
    ar1: column(v => v.ar1),
    recoveryRate: column(v => (v.recovery.status === 'ok' ? v.recovery.rate : Number.NaN)),
    recoveryStatus: rows.map(row => row.values.recovery.status),
    skewness: column(v => v.skewness),
    kurtosis: column(v => v.kurtosis),
  }
}

/** Calls `visit` with the rolling window's indicators each time it is full, every `step` samples. */
export function forEachFullWindow(
  times: ArrayLike<number>, residuals: ArrayLike<number>, options: SeriesOptions,
  visit: (indicators: Indicators, time: number) => void,
): void {
  const step = options.step ?? 1
  if (!(Number.isInteger(step) && step >= 1)) throw new RangeError(`step must be a positive integer, got ${step}`)
  const window = new RollingWindow(options.window)
  const levels = options.levels ?? residuals
  const start = times[0]!
  let sinceLast = step
  for (let i = 0; i < residuals.length; i++) {
    window.push(times[i]!, residuals[i]!, levels[i]!)
    const full = options.window.kind === 'count'
      ? window.size === options.window.samples
      : times[i]! - start >= options.window.seconds
    if (!full) continue
    if (++sinceLast >= step) {
      visit(window.indicators(), times[i]!)
      sinceLast = 0
    }
  }
}
