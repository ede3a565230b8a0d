// From-scratch window moments: the reference the incremental path must reproduce.
import type { CentredSums } from './types'

/**
 * Power sums of d = x − shift over a window, plus what the lag-1 sum needs at its ends. Both the
 * from-scratch and the incremental path keep these and convert with `centredFromShifted`.
 */
export interface ShiftedSums {
  n: number
  shift: number
  s1: number
  s2: number
  s3: number
  s4: number
  /** Σ_{i≥2} d_i·d_{i−1}. */
  lag: number
  /** d of the oldest and of the newest sample. */
  first: number
  last: number
}

/**
 * Central sums from sums about a shift close to the mean. With a = Σd/n the mean's offset from
 * the shift, the binomial expansions are exact; they lose only a factor (1 + a²/σ²) of precision,
 * which is ≈ 1 when the shift is near the mean. The mean itself is never rounded to a double
 * before centring: on NIST NumAcc-style data (offset 1e7) that rounding alone moves Σd³ by
 * 3·δ·Σd² with δ up to half an ulp of 1e7, enough to spoil a small skewness at the 1e-6 level.
 */
export function centredFromShifted(p: ShiftedSums): CentredSums {
  const { n, s1, s2, s3, s4 } = p
  const a = s1 / n
  const a2 = a * a
  return {
    n,
    mean: p.shift + a,
    sum2: s2 - a * s1,
    sum3: s3 - 3 * a * s2 + 2 * n * a2 * a,
    sum4: s4 - 4 * a * s3 + 6 * a2 * s2 - 3 * n * a2 * a2,
    lagSum: p.lag - a * (2 * s1 - p.first - p.last) + (n - 1) * a2,
  }
}

/** Power sums of values[start, end) about `shift`. O(n). */
export function shiftedSums(values: ArrayLike<number>, shift: number, start = 0, end = values.length): ShiftedSums {
  const sums: ShiftedSums = { n: end - start, shift, s1: 0, s2: 0, s3: 0, s4: 0, lag: 0, first: 0, last: 0 }
  let previous = 0
  for (let i = start; i < end; i++) {
    const d = values[i]! - shift
    const d2 = d * d
    sums.s1 += d
    sums.s2 += d2
    sums.s3 += d2 * d
    sums.s4 += d2 * d2
    if (i > start) sums.lag += d * previous
    previous = d
  }
  sums.first = values[start]! - shift
  sums.last = previous
  return sums
}

/**
 * Mean by the corrected two-pass method (Chan, Golub & LeVeque 1983) [from memory]: the second
 * pass adds back the rounding error of the first.
 */
export function accurateMean(values: ArrayLike<number>, start = 0, end = values.length): number {
  const n = end - start
  let sum = 0
  for (let i = start; i < end; i++) sum += values[i]!
  const rough = sum / n
  let correction = 0
  for (let i = start; i < end; i++) correction += values[i]! - rough
  return rough + correction / n
}

/**
 * Centred power sums and the lag-1 cross sum of values[start, end): sums about the accurate mean,
 * then the exact correction for the mean's own rounding. O(n), three passes.
 */
export function centredSums(values: ArrayLike<number>, start = 0, end = values.length): CentredSums {
  if (end - start < 1) throw new RangeError(`window must hold at least one value, got ${end - start}`)
  return centredFromShifted(shiftedSums(values, accurateMean(values, start, end), start, end))
}
