// Kendall's rank correlation with ties (docs/science.md §S3.4, §S12): τ-b, S, Var(S) and normal-approximation
// p-values. The fast path is Knight's (1966) O(n log n) algorithm [from memory]: sort by (x, y),
// then count the inversions of y with a merge sort.
import { normalUpperTail } from './normal'

export interface KendallResult {
  n: number
  /** S = concordant − discordant pairs. */
  s: number
  tauA: number
  /** τ-b = S/√((n₀ − n₁)(n₀ − n₂)); NaN when either variable is constant. */
  tauB: number
  /** Var(S) under independence, with the tie corrections of Kendall (1970). */
  varianceS: number
  /** z = S/√Var(S), no continuity correction (as R `cor.test(..., exact = FALSE)`). */
  z: number
  /** One-sided p for a positive association, 1 − Φ(z). */
  pGreater: number
  /** One-sided p for a negative association, Φ(z). */
  pLess: number
  pTwoSided: number
}

/** Kendall's τ in O(n log n). */
export function kendallTau(x: ArrayLike<number>, y: ArrayLike<number>): KendallResult {
  const n = checkPaired(x, y)
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => (x[a]! - x[b]!) || (y[a]! - y[b]!))
  let xTiePairs = 0
  let jointTiePairs = 0
  let xRun = 1
  let jointRun = 1
  for (let k = 1; k <= n; k++) {
    const sameX = k < n && x[order[k]!] === x[order[k - 1]!]
    const sameXY = sameX && y[order[k]!] === y[order[k - 1]!]
    if (sameXY) jointRun++
    else { jointTiePairs += jointRun * (jointRun - 1) / 2; jointRun = 1 }
    if (sameX) xRun++
    else { xTiePairs += xRun * (xRun - 1) / 2; xRun = 1 }
  }
  const ys = Float64Array.from(order, i => y[i]!)
  const inversions = mergeSortCountingInversions(ys)
  const n0 = n * (n - 1) / 2
  const yTiePairs = tieStatistics(ys).pairs
  const s = n0 - xTiePairs - yTiePairs + jointTiePairs - 2 * inversions
  return kendallFromS(s, n, tieStatistics(Float64Array.from(x).sort()), tieStatistics(ys))
}

/** Kendall's τ by comparing every pair, O(n²). The reference the fast path is tested against. */
export function kendallTauNaive(x: ArrayLike<number>, y: ArrayLike<number>): KendallResult {
  const n = checkPaired(x, y)
  let s = 0
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) s += Math.sign(x[j]! - x[i]!) * Math.sign(y[j]! - y[i]!)
  }
  return kendallFromS(s, n, tieStatistics(Float64Array.from(x).sort()), tieStatistics(Float64Array.from(y).sort()))
}

/** Sums over tie groups of sizes t: Σt(t−1)/2, Σt(t−1)(2t+5), Σt(t−1)(t−2), Σt(t−1). */
interface TieStatistics {
  pairs: number
  v0: number
  v1: number
  v2: number
}

/** Tie statistics of a sorted array. */
function tieStatistics(sorted: Float64Array): TieStatistics {
  const stats: TieStatistics = { pairs: 0, v0: 0, v1: 0, v2: 0 }
  let run = 1
  for (let k = 1; k <= sorted.length; k++) {
    if (k < sorted.length && sorted[k] === sorted[k - 1]) { run++; continue }
    if (run > 1) {
      stats.pairs += run * (run - 1) / 2
      stats.v0 += run * (run - 1) * (2 * run + 5)
      stats.v1 += run * (run - 1) * (run - 2)
      stats.v2 += run * (run - 1)
    }
    run = 1
  }
  return stats
}

function kendallFromS(s: number, n: number, xTies: TieStatistics, yTies: TieStatistics): KendallResult {
  const n0 = n * (n - 1) / 2
  const varianceS = (n * (n - 1) * (2 * n + 5) - xTies.v0 - yTies.v0) / 18
    + (n > 2 ? (xTies.v1 * yTies.v1) / (9 * n * (n - 1) * (n - 2)) : 0)
    + (xTies.v2 * yTies.v2) / (2 * n * (n - 1))
  const z = varianceS > 0 ? s / Math.sqrt(varianceS) : Number.NaN
  const pGreater = normalUpperTail(z)
  const pLess = normalUpperTail(-z)
  return {
    n,
    s,
    tauA: s / n0,
    tauB: s / Math.sqrt((n0 - xTies.pairs) * (n0 - yTies.pairs)),
    varianceS,
    z,
    pGreater,
    pLess,
    pTwoSided: Math.min(1, 2 * Math.min(pGreater, pLess)),
  }
}

function checkPaired(x: ArrayLike<number>, y: ArrayLike<number>): number {
  if (x.length !== y.length) throw new RangeError(`x and y differ in length: ${x.length} vs ${y.length}`)
  if (x.length < 2) throw new RangeError(`Kendall's τ needs at least 2 pairs, got ${x.length}`)
  return x.length
}

/** Sorts `values` ascending in place (stable, bottom-up merge) and returns the number of pairs i < j with values[i] > values[j]. */
function mergeSortCountingInversions(values: Float64Array): number {
  const n = values.length
  let source: Float64Array = values
  let target: Float64Array = new Float64Array(n)
  let inversions = 0
  for (let width = 1; width < n; width *= 2) {
    for (let lo = 0; lo < n; lo += 2 * width) {
      const mid = Math.min(lo + width, n)
      const hi = Math.min(lo + 2 * width, n)
      let i = lo
      let j = mid
      let k = lo
      while (i < mid && j < hi) {
        if (source[i]! <= source[j]!) target[k++] = source[i++]!
        else { inversions += mid - i; target[k++] = source[j++]! }
      }
      while (i < mid) target[k++] = source[i++]!
      while (j < hi) target[k++] = source[j++]!
    }
    [source, target] = [target, source]
  }
  if (source !== values) values.set(source)
  return inversions
}

/** Kendall's τ-b of a series against its own order (time has no ties), the trend statistic of A3 step 4. */
export function trendTau(series: ArrayLike<number>): number {
  return kendallTau(Float64Array.from({ length: series.length }, (_, i) => i), series).tauB
}
