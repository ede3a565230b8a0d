// The quality gate: a window that fails it yields no indicators, so bad data can never alarm.
// Checks run cheapest first; the first failure is reported (docs/science.md §S2.1).
import { centredSums } from './moments'
import type { QualityLimits, QualityVerdict } from './types'

/** Defaults for a window of a few thousand samples; every plant tag can override them. */
export const DEFAULT_QUALITY_LIMITS: QualityLimits = {
  minSamples: 100,
  maxGapSeconds: Number.POSITIVE_INFINITY,
  minDistinctLevels: 10,
  minSdInSteps: 2,
  maxRepeatFraction: 0.05,
  maxCollinearFraction: 0.2,
}

/** Runs the quality checks over one window of (time, raw value) samples. */
export function checkQuality(times: ArrayLike<number>, values: ArrayLike<number>, limits: QualityLimits): QualityVerdict {
  const n = values.length
  if (n < limits.minSamples) return fail('too few samples', `${n} samples, need ${limits.minSamples}`)
  const gap = largestGap(times)
  if (gap > limits.maxGapSeconds) return fail('gap', `a gap of ${gap} s exceeds ${limits.maxGapSeconds} s`)
  const repeat = longestRepeatRun(values)
  if (repeat === n) return fail('stuck', `all ${n} values equal ${values[0]}`)
  const levels = levelStatistics(values)
  if (levels.distinct < limits.minDistinctLevels) {
    return fail('quantized', `only ${levels.distinct} distinct values, need ${limits.minDistinctLevels}`)
  }
  if (levels.sd < limits.minSdInSteps * levels.step) {
    return fail('quantized', `SD ${levels.sd} is under ${limits.minSdInSteps} resolution steps of ${levels.step}`)
  }
  if (repeat > limits.maxRepeatFraction * n) {
    return fail('compressed', `${repeat} identical values in a row (limit ${Math.floor(limits.maxRepeatFraction * n)})`)
  }
  const collinear = collinearFraction(times, values)
  if (collinear > limits.maxCollinearFraction) {
    return fail('compressed', `${(100 * collinear).toFixed(1)}% of points lie exactly on the line through their neighbours`)
  }
  return { ok: true }
}

function fail(failed: Exclude<QualityVerdict, { ok: true }>['failed'], reason: string): QualityVerdict {
  return { ok: false, failed, reason }
}

function largestGap(times: ArrayLike<number>): number {
  let gap = 0
  for (let i = 1; i < times.length; i++) gap = Math.max(gap, times[i]! - times[i - 1]!)
  return gap
}

function longestRepeatRun(values: ArrayLike<number>): number {
  let longest = values.length > 0 ? 1 : 0
  let run = 1
  for (let i = 1; i < values.length; i++) {
    run = values[i] === values[i - 1] ? run + 1 : 1
    longest = Math.max(longest, run)
  }
  return longest
}

/**
 * Number of distinct values, the SD, and the resolution step: the smallest gap between distinct
 * values (for a quantized signal, the quantum; for a continuous one, a tiny number that passes).
 */
function levelStatistics(values: ArrayLike<number>): { distinct: number, sd: number, step: number } {
  const sorted = Float64Array.from(values).sort()
  let distinct = 1
  let step = Number.POSITIVE_INFINITY
  for (let i = 1; i < sorted.length; i++) {
    const gap = sorted[i]! - sorted[i - 1]!
    if (gap > 0) {
      distinct++
      step = Math.min(step, gap)
    }
  }
  return { distinct, sd: Math.sqrt(centredSums(values).sum2 / Math.max(1, values.length - 1)), step }
}

/**
 * Share of interior points on the straight line through their neighbours (to rounding), with a
 * non-zero slope: what linear interpolation between historian breakpoints leaves behind. Runs of
 * equal values are counted by the repeat check instead.
 */
function collinearFraction(times: ArrayLike<number>, values: ArrayLike<number>): number {
  const n = values.length
  if (n < 3) return 0
  let count = 0
  for (let i = 1; i < n - 1; i++) {
    const left = (values[i]! - values[i - 1]!) * (times[i + 1]! - times[i]!)
    const right = (values[i + 1]! - values[i]!) * (times[i]! - times[i - 1]!)
    const scale = Math.max(Math.abs(left), Math.abs(right))
    if (scale > 0 && Math.abs(left - right) <= 1e-9 * scale) count++
  }
  return count / (n - 2)
}
