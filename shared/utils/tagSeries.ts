// What the tag-detail charts show, computed from raw samples: the indicators run over every raw
// sample with the engine's own functions; only the result is reduced to display buckets.
import { detrend } from '../analysis/detrend'
import { rollingIndicators } from '../analysis/windowAnalysis'
import { evaluateRecord, type EvaluationPoint } from '../pipeline/evaluateRecord'
import type { ChartIndicatorSettings as IndicatorSettings } from './chartIndicatorSettings'
import { bucketOf, bucketSamples, fillFromArchive, toJsonNumbers, type ArchivedMinutes, type BucketGrid } from './timeBuckets'

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
  /** The fitted recovery rate from the end of the range toward the projected fold. */
  recoveryProjection: (number | null)[]
  fold: FoldView
  significance: { ar1: TrendSignificance, variance: TrendSignificance } | null
  /** Raw samples in the displayed range (before downsampling). */
  sampleCount: number
  /** Readings older than the raw window drawn from the per-minute archive (value line only). */
  archivedSampleCount: number
}

export interface TagSeriesInput {
  /** Time-sorted raw samples in epoch seconds, starting at least one window before `grid.from`. */
  times: Float64Array
  values: Float64Array
  grid: BucketGrid
  settings: IndicatorSettings
  /** The tag id: the live path seeds its bootstrap from it, so chart and live p agree. */
  seed: number
  /**
   * Per-minute archive rows for the part of the range raw samples no longer cover: they fill the
   * value line's empty buckets. The indicators need raw samples, so they stay empty there.
   */
  archive?: ArchivedMinutes
}

const PROJECTION_POINTS = 40

export function buildTagSeries(input: TagSeriesInput): TagSeriesView {
  const { times, values, grid, settings } = input
  const buckets = bucketSamples(times, values, grid)
  const archivedSampleCount = input.archive ? fillFromArchive(buckets, input.archive, grid) : 0
  const { trend, residuals } = detrend(times, values, settings.detrend)
  const pick = (series: Float64Array) => Array.from(buckets.last, i => (i < 0 ? null : series[i]!))
  const sampleCount = countInGrid(times, grid)
  const indicatorCols = indicatorBuckets(input, sampleCount)
  const judgement = judgementAtNewest(input)
  const fold = foldView(judgement)
  const projection = projectionPoints(fold, indicatorCols.newestRate, grid)
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
    fold,
    significance: judgement && judgement.pAr1 !== null
      ? { ar1: { tau: judgement.tauAr1, p: judgement.pAr1 }, variance: { tau: judgement.tauVariance, p: judgement.pVariance } }
      : null,
    sampleCount,
    archivedSampleCount,
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
  let newestRate: number | null = null
  if (times.length < settings.window.samples) return { variance, ar1, recoveryRate, newestRate }
  const step = Math.max(1, Math.floor(samplesInRange / grid.count))
  const series = rollingIndicators(times, values, { window: settings.window, detrend: settings.detrend, step })
  for (let k = 0; k < series.time.length; k++) {
    const b = bucketOf(grid, series.time[k]!)
    if (b < 0) continue
    const finite = (v: number) => (Number.isFinite(v) ? v : null)
    variance[b] = finite(series.variance[k]!)
    ar1[b] = finite(series.ar1[k]!)
    recoveryRate[b] = finite(series.recoveryRate[k]!)
    if (Number.isFinite(series.recoveryRate[k]!)) newestRate = series.recoveryRate[k]!
  }
  return { variance, ar1, recoveryRate, newestRate }
}

/** The live evaluation (shared/pipeline/evaluateRecord) at the newest sample only. */
function judgementAtNewest(input: TagSeriesInput): EvaluationPoint | null {
  const { times, values, settings } = input
  if (times.length === 0) return null
  const period = settings.windowSeconds / settings.window.samples
  const { points } = evaluateRecord({
    tagId: input.seed, times, values, firstNew: times.length - 1,
    samplesSinceEvaluation: settings.live.evaluateEvery - 1, samplePeriodS: period, settings: settings.live,
  })
  return points[0] ?? null
}

function foldView(point: EvaluationPoint | null): FoldView {
  if (!point || point.evidence === null) return { kind: 'none', reason: point?.quality ?? 'not enough samples for a judgement yet' }
  if (point.fold.kind !== 'projected') return { kind: 'none', reason: 'no fold in view: the recovery rate is not falling toward zero' }
  return {
    kind: 'projected', foldTime: point.time + point.fold.seconds, low: point.time + point.fold.lowSeconds,
    high: point.time + point.fold.highSeconds, seconds: point.fold.seconds,
  }
}

/**
 * The recovery rate drawn forward from the newest estimate to zero at the projected fold along
 * the square-root law k ∝ √(t_fold − t) (docs/science.md §S1.1), no further than half the displayed
 * range past its end, so a distant fold does not squash the history.
 */
function projectionPoints(fold: FoldView, newestRate: number | null, grid: BucketGrid) {
  const none = { time: [] as number[], rate: [] as (number | null)[], startRate: null as number | null }
  if (fold.kind !== 'projected' || newestRate === null) return none
  const foldTime = fold.foldTime
  const until = Math.min(foldTime, grid.to + (grid.to - grid.from) / 2)
  if (until <= grid.to) return none
  const rateAt = (t: number) => newestRate * Math.sqrt(Math.max(0, (foldTime - t) / (foldTime - grid.to)))
  const time = Array.from({ length: PROJECTION_POINTS }, (_, i) => grid.to + ((i + 1) / PROJECTION_POINTS) * (until - grid.to))
  return { time, rate: time.map(rateAt), startRate: rateAt(grid.to) }
}
