// The unit's slow mode from its tags' recent samples: tags are put on one time grid (the slowest
// tag's sample period), detrended like the charts, and the engine's VAR(1) fit runs over a
// sliding window of that grid to give the slowest recovery rate over time.
import { detrend } from '../analysis/detrend'
import { slowMode } from '../analysis/slowMode'
import type { DetrendSpec } from '../analysis/types'
import { bucketSamples, type BucketGrid } from './timeBuckets'

export interface TagSamples { tagId: number, samplePeriodS: number, times: Float64Array, values: Float64Array }

export interface UnitSlowModeView {
  gridSeconds: number
  /** Tags that entered the fit, in the order of `shares`. */
  tagIds: number[]
  /** Tags left out, with the reason (no samples in the range). */
  skipped: { tagId: number, reason: string }[]
  /** Each tag's share of the slowest joint direction in the newest window; sums to 1. */
  shares: number[]
  /** Slowest recovery rate (1/s) of the newest window, null when no recovery is seen. */
  recoveryRate: number | null
  /** Slowest recovery rate per window end (epoch seconds), aligned arrays. */
  history: { time: number[], recoveryRate: (number | null)[] }
  reason: string | null
}

// A window needs enough grid points for a stable m×m covariance (10 per tag, at least 60); up to
// 300 when the range allows, as for a tag's own indicators, and a third of the range so the
// history has several independent windows.
const MIN_WINDOW_POINTS = 60
const MAX_WINDOW_POINTS = 300
const HISTORY_POINTS = 120

/**
 * Puts each tag on the common grid by bucket mean, carrying the last value across empty buckets.
 * Not the live fit's alignment (shared/pipeline/alignTags.ts, behind unit alarms), on purpose: the
 * live fit keeps only cells where every tag reported and takes each tag's last sample, so an alarm
 * never rests on a carried value; this view fills gaps so a short dropout does not blank the
 * chart's history. Where every tag has one sample per cell the two agree.
 */
export function fillOnBucketGrid(tags: readonly TagSamples[], grid: BucketGrid): Float64Array[] {
  return tags.map((tag) => {
    const { mean } = bucketSamples(tag.times, tag.values, grid)
    let carry = Number.NaN
    for (let i = 0; i < mean.length; i++) {
      if (Number.isFinite(mean[i]!)) carry = mean[i]!
      else mean[i] = carry
    }
    // Leading empty buckets take the first value seen, so the series has no NaN at all.
    const first = mean.find(Number.isFinite) ?? Number.NaN
    for (let i = 0; i < mean.length && !Number.isFinite(mean[i]!); i++) mean[i] = first
    return mean
  })
}

export function buildUnitSlowMode(tags: readonly TagSamples[], range: { from: number, to: number }): UnitSlowModeView {
  const withData = tags.filter(t => t.times.some(time => time >= range.from && time < range.to))
  const skipped = tags.filter(t => !withData.includes(t)).map(t => ({ tagId: t.tagId, reason: 'no samples in the range' }))
  const gridSeconds = Math.max(...tags.map(t => t.samplePeriodS))
  const count = Math.floor((range.to - range.from) / gridSeconds)
  const empty = { gridSeconds, tagIds: withData.map(t => t.tagId), skipped, shares: [], recoveryRate: null, history: { time: [], recoveryRate: [] } }
  const minPoints = Math.max(MIN_WINDOW_POINTS, 10 * withData.length)
  const windowPoints = Math.max(minPoints, Math.min(MAX_WINDOW_POINTS, Math.floor(count / 3)))
  if (withData.length === 0) return { ...empty, reason: 'no tag of this unit has samples in the range' }
  if (count < minPoints) return { ...empty, reason: `${count} grid points of ${gridSeconds} s in the range, need ${minPoints}` }
  const grid = { from: range.to - count * gridSeconds, to: range.to, count }
  const gridTimes = Float64Array.from({ length: count }, (_, i) => grid.from + (i + 1) * gridSeconds)
  const spec: DetrendSpec = { kind: 'localLinear', bandwidth: windowPoints * gridSeconds }
  const residuals = fillOnBucketGrid(withData, grid).map(series => detrend(gridTimes, series, spec).residuals)
  const step = Math.max(1, Math.floor((count - windowPoints) / HISTORY_POINTS))
  const history = { time: [] as number[], recoveryRate: [] as (number | null)[] }
  let newest: ReturnType<typeof slowMode> | null = null
  for (let end = count; end >= windowPoints; end -= step) {
    const fit = fitWindow(residuals, end - windowPoints, end, gridSeconds)
    newest ??= fit
    history.time.unshift(gridTimes[end - 1]!)
    history.recoveryRate.unshift(fit?.recoveryRate ?? null)
  }
  if (!newest) return { ...empty, history, reason: 'the newest window could not be fitted (a tag is constant)' }
  return { ...empty, history, shares: newest.shares, recoveryRate: newest.recoveryRate, reason: null }
}

/** The VAR(1) slow mode of one window, or null when its covariance is singular (a flat tag). */
function fitWindow(residuals: Float64Array[], start: number, end: number, dt: number) {
  try {
    const fit = slowMode(residuals.map(r => r.subarray(start, end)), dt)
    return fit.shares.every(Number.isFinite) ? fit : null
  }
  catch {
    return null
  }
}
