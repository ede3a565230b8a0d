// What the tag-detail charts show, computed from raw samples: the indicators run over every raw
// sample with the engine's own functions; only the result is reduced to display buckets.
import { detrend } from '../analysis/detrend'
import { foldHorizon, recoveryRateSe } from '../analysis/foldHorizon'
import { rollingIndicators } from '../analysis/pipeline'
import { createRng } from '../analysis/random'
import { surrogateTrendTest } from '../analysis/trendTest'
import type { ChartIndicatorSettings as IndicatorSettings } from './chartIndicatorSettings'
import { bucketOf, bucketSamples, toJsonNumbers, type BucketGrid } from './timeBuckets'

export interface TrendSignificance { tau: number | null, p: number | null }

export type FoldView =
  | { kind: 'projected', foldTime: number, low: number | null, high: number | null, seconds: number }
  | { kind: 'none', reason: string }

export interface TagSeriesView {
  /** Epoch seconds: one per display bucket, then (when a fold is in view) the projection's times. */
  time: number[]
  value: (number | null)[]
  valueMin: (number | null)[]
  valueMax: (number | null)[]
  trend: (number | null)[]
  residual: (number | null)[]
  variance: (number | null)[]
  ar1: (number | null)[]
  recoveryRate: (number | null)[]
  /** √(slope·(t − t_fold)): the fitted k² line from the end of the range toward the projected fold. */
  recoveryProjection: (number | null)[]
  fold: FoldView
  significance: { ar1: TrendSignificance, variance: TrendSignificance } | null
  /** Raw samples in the displayed range (before downsampling). */
  sampleCount: number
}

export interface TagSeriesInput {
  /** Time-sorted raw samples in epoch seconds, starting at least one window before `grid.from`. */
  times: Float64Array
  values: Float64Array
  grid: BucketGrid
  settings: IndicatorSettings
  /** Seed of the surrogate test, so a reload shows the same p-value for the same data. */
  seed: number
}

// Fold projection: trailing twenty windows of rate points, falling slope significant at the
// tag's alpha, a 90 % band (SCIENCE.md A1).
const FOLD_WINDOWS = 20
const PROJECTION_POINTS = 40

export function buildTagSeries(input: TagSeriesInput): TagSeriesView {
  const { times, values, grid, settings } = input
  const buckets = bucketSamples(times, values, grid)
  const { trend, residuals } = detrend(times, values, settings.detrend)
  const pick = (series: Float64Array) => Array.from(buckets.last, i => (i < 0 ? null : series[i]!))
  const sampleCount = countInGrid(times, grid)
  const indicatorCols = indicatorBuckets(input, sampleCount)
  const fold = projectFold(indicatorCols.rates, settings)
  const projection = projectionPoints(fold, grid)
  const nulls = (n: number) => Array.from({ length: n }, () => null)
  const extra = projection.time.length
  return {
    time: [...Array.from(buckets.time), ...projection.time],
    value: [...toJsonNumbers(buckets.mean), ...nulls(extra)],
    valueMin: [...toJsonNumbers(buckets.min), ...nulls(extra)],
    valueMax: [...toJsonNumbers(buckets.max), ...nulls(extra)],
    trend: [...pick(trend), ...nulls(extra)],
    residual: [...pick(residuals), ...nulls(extra)],
    variance: [...indicatorCols.variance, ...nulls(extra)],
    ar1: [...indicatorCols.ar1, ...nulls(extra)],
    recoveryRate: [...indicatorCols.recoveryRate, ...nulls(extra)],
    recoveryProjection: [...nulls(grid.count - 1), projection.startRate, ...projection.rate],
    fold: fold.view,
    significance: trendSignificance(times, residuals, settings, input.seed),
    sampleCount,
  }
}

function countInGrid(times: Float64Array, grid: BucketGrid): number {
  let n = 0
  for (const t of times) if (t >= grid.from && t < grid.to) n++
  return n
}

/** Rolling indicators over the raw samples, evaluated about once per display bucket. */
function indicatorBuckets(input: TagSeriesInput, samplesInRange: number) {
  const { times, values, grid, settings } = input
  const empty = () => Array.from({ length: grid.count }, (): number | null => null)
  const variance = empty()
  const ar1 = empty()
  const recoveryRate = empty()
  const rates: { time: number, rate: number, se: number }[] = []
  if (times.length < settings.window.samples) return { variance, ar1, recoveryRate, rates }
  const step = Math.max(1, Math.floor(samplesInRange / grid.count))
  const series = rollingIndicators(times, values, { window: settings.window, detrend: settings.detrend, step })
  const dt = settings.windowSeconds / settings.window.samples
  for (let k = 0; k < series.time.length; k++) {
    const b = bucketOf(grid, series.time[k]!)
    if (b < 0) continue
    const finite = (v: number) => (Number.isFinite(v) ? v : null)
    variance[b] = finite(series.variance[k]!)
    ar1[b] = finite(series.ar1[k]!)
    recoveryRate[b] = finite(series.recoveryRate[k]!)
    const rate = series.recoveryRate[k]!
    if (Number.isFinite(rate)) rates.push({ time: series.time[k]!, rate, se: recoveryRateSe(rate, dt, settings.window.samples) })
  }
  return { variance, ar1, recoveryRate, rates }
}

function projectFold(rates: { time: number, rate: number, se: number }[], settings: IndicatorSettings) {
  const newest = rates.at(-1)
  if (!newest) return { view: { kind: 'none', reason: 'no recovery-rate estimates in this range yet' } as FoldView, slope: 0 }
  const trailing = rates.filter(p => p.time > newest.time - FOLD_WINDOWS * settings.windowSeconds)
  const result = foldHorizon(trailing, { windowSeconds: settings.windowSeconds, alpha: settings.alpha, confidence: 0.9, now: newest.time })
  if (result.kind === 'no fold in view') return { view: { kind: 'none', reason: result.reason } as FoldView, slope: 0 }
  const finiteOrNull = (v: number) => (Number.isFinite(v) ? v : null)
  return {
    view: { kind: 'projected', foldTime: result.foldTime, low: finiteOrNull(result.low), high: finiteOrNull(result.high), seconds: result.horizon } as FoldView,
    slope: result.slope,
  }
}

/**
 * The fitted line k² = slope·(t − t_fold) drawn forward from the newest estimate, no further than
 * half the displayed range past its end, so a distant fold does not squash the history.
 */
function projectionPoints(fold: ReturnType<typeof projectFold>, grid: BucketGrid) {
  const none = { time: [] as number[], rate: [] as (number | null)[], startRate: null as number | null }
  if (fold.view.kind !== 'projected') return none
  const foldTime = fold.view.foldTime
  const until = Math.min(foldTime, grid.to + (grid.to - grid.from) / 2)
  if (until <= grid.to) return none
  const rateAt = (t: number) => Math.sqrt(Math.max(0, fold.slope * (t - foldTime)))
  const time = Array.from({ length: PROJECTION_POINTS }, (_, i) => grid.to + ((i + 1) / PROJECTION_POINTS) * (until - grid.to))
  return { time, rate: time.map(rateAt), startRate: rateAt(grid.to) }
}

function trendSignificance(times: Float64Array, residuals: Float64Array, settings: IndicatorSettings, seed: number) {
  // The trailing trend window, as the live pipeline tests it.
  const n = Math.min(residuals.length, settings.trendWindowSamples)
  if (n < settings.window.samples + 2 * settings.indicatorStep) return null
  const start = residuals.length - n
  const result = surrogateTrendTest(times.subarray(start), residuals.subarray(start), {
    window: settings.window,
    step: settings.indicatorStep,
    surrogates: settings.surrogates,
    kind: 'ar1',
    indicators: ['ar1', 'variance'],
  }, createRng(seed))
  const pack = (r: { tau: number, p: number } | undefined): TrendSignificance =>
    ({ tau: r && Number.isFinite(r.tau) ? r.tau : null, p: r ? r.p : null })
  return { ar1: pack(result.ar1), variance: pack(result.variance) }
}
