// The unit's slow mode from its tags' recent samples: tags are put on one time grid (the slowest
// tag's sample period), detrended like the charts, and the engine's VAR(1) fit runs over a
// sliding window of that grid to give the slowest recovery rate over time.
import { detrend } from '../analysis/detrend'
import { slowMode } from '../analysis/slowMode'
import type { DetrendSpec } from '../analysis/types'
import { formatDuration } from './duration'
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
  /**
   * How far each tag's share moved over the newest windows (those ending within the last quarter
   * of a window, so they share most of their data): lowest and highest, in the order of `shares`.
   */
  shareSpread: { low: number[], high: number[], windows: number, seconds: number } | null
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

/** The common grid (the slowest tag's period) and the fit's window for a range of `rangeSeconds`. */
export function slowModeWindow(samplePeriods: readonly number[], rangeSeconds: number) {
  const gridSeconds = Math.max(...samplePeriods)
  const count = Math.floor(rangeSeconds / gridSeconds)
  const minPoints = Math.max(MIN_WINDOW_POINTS, 10 * samplePeriods.length)
  const windowPoints = Math.max(minPoints, Math.min(MAX_WINDOW_POINTS, Math.floor(count / 3)))
  /** Samples this long before the range let the first window end at the range's start. */
  return { gridSeconds, count, minPoints, windowPoints, leadSeconds: windowPoints * gridSeconds }
}

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

/**
 * The slow mode over `range`. Samples from up to one window before the range (`slowModeWindow`'s
 * leadSeconds) let the history start at the range's start, so a 1 h view spans the hour instead
 * of its last 30 min; a window is fitted only where every tag already has samples.
 */
export function buildUnitSlowMode(tags: readonly TagSamples[], range: { from: number, to: number }): UnitSlowModeView {
  const withData = tags.filter(t => t.times.some(time => time >= range.from && time < range.to))
  const skipped = tags.filter(t => !withData.includes(t)).map(t => ({ tagId: t.tagId, reason: 'no samples in the range' }))
  const { gridSeconds, count, minPoints, windowPoints } = slowModeWindow(tags.map(t => t.samplePeriodS), range.to - range.from)
  const empty = {
    gridSeconds, tagIds: withData.map(t => t.tagId), skipped, shares: [], shareSpread: null, recoveryRate: null,
    history: { time: [], recoveryRate: [] },
  }
  if (withData.length === 0) return { ...empty, reason: 'no tag of this unit has samples in the range' }
  if (count < minPoints) return { ...empty, reason: `${count} grid points of ${gridSeconds} s in the range, need ${minPoints}` }
  const points = count + windowPoints
  const grid = { from: range.to - points * gridSeconds, to: range.to, count: points }
  const gridTimes = Float64Array.from({ length: points }, (_, i) => grid.from + (i + 1) * gridSeconds)
  const spec: DetrendSpec = { kind: 'localLinear', bandwidth: windowPoints * gridSeconds }
  const residuals = fillOnBucketGrid(withData, grid).map(series => detrend(gridTimes, series, spec).residuals)
  // Before every tag has reported, the grid holds carried copies of a first value, not data.
  const dataFrom = Math.max(...withData.map(t => t.times[0]!))
  const step = Math.max(1, Math.floor(count / HISTORY_POINTS))
  const history = { time: [] as number[], recoveryRate: [] as (number | null)[] }
  const fits: { end: number, shares: number[], recoveryRate: number | null }[] = []
  for (let end = points; end >= windowPoints && gridTimes[end - windowPoints]! >= dataFrom; end -= step) {
    const fit = fitWindow(residuals, end - windowPoints, end, gridSeconds)
    if (fit) fits.push({ end: gridTimes[end - 1]!, shares: fit.shares, recoveryRate: fit.recoveryRate })
    history.time.unshift(gridTimes[end - 1]!)
    history.recoveryRate.unshift(fit?.recoveryRate ?? null)
  }
  const newest = fits[0]
  if (!newest) return { ...empty, history, reason: 'the newest window could not be fitted (a tag is constant)' }
  const recent = fits.filter(f => newest.end - f.end <= windowPoints * gridSeconds / 4)
  const shareSpread = {
    low: newest.shares.map((_, j) => Math.min(...recent.map(f => f.shares[j]!))),
    high: newest.shares.map((_, j) => Math.max(...recent.map(f => f.shares[j]!))),
    windows: recent.length,
    seconds: newest.end - recent.at(-1)!.end,
  }
  return { ...empty, history, shares: newest.shares, shareSpread, recoveryRate: newest.recoveryRate, reason: null }
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

/** Beyond this many percentage points of movement over the newest windows, the split is called not stable. */
export const UNSTABLE_SHARE_POINTS = 20

/**
 * How steady the split between tags is, in words (issue 12 item 7): a share that swings from
 * 61 % to 97 % between overlapping windows is not a finding, and the page must say so.
 */
export function shareSpreadText(spread: UnitSlowModeView['shareSpread']): { text: string, stable: boolean } | null {
  if (!spread || spread.windows < 2) return null
  const moved = Math.round(100 * Math.max(...spread.high.map((high, j) => high - spread.low[j]!)))
  const points = `${moved} ${moved === 1 ? 'point' : 'points'}`
  const over = `over the last ${formatDuration(spread.seconds)} (${spread.windows} overlapping fits)`
  return moved > UNSTABLE_SHARE_POINTS
    ? { stable: false, text: `Not stable: a share moved by up to ${points} ${over}. Read the split as rough; the slowest recovery rate is the firmer figure.` }
    : { stable: true, text: `Steady: every share stayed within ${points} ${over}.` }
}
