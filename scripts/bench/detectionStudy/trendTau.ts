// Kendall τ-b of a series against its own time order, for the surrogate loops of the baseline,
// which compute it hundreds of thousands of times. Time has no ties, so
//   S = n₀ − (tied pairs of y) − 2·(pairs i < j with y_i > y_j),   τ-b = S/√(n₀·(n₀ − tied pairs)),
// and the inversions come from one merge sort of a typed array (Knight 1966, J Am Stat Assoc
// 61:436–439 [from memory]). Same value as shared/analysis/kendall.ts trendTau (unit-tested).

/** τ-b of values against 0, 1, 2, …; NaN for a constant series or fewer than 2 values. */
export function trendTauFast(values: ArrayLike<number>): number {
  const n = values.length
  if (n < 2) return Number.NaN
  let source = Float64Array.from(values)
  let target = new Float64Array(n)
  let inversions = 0
  for (let width = 1; width < n; width *= 2) {
    for (let lo = 0; lo < n; lo += 2 * width) {
      const mid = Math.min(lo + width, n)
      const hi = Math.min(lo + 2 * width, n)
      let i = lo, j = mid, k = lo
      while (i < mid && j < hi) {
        if (source[i]! <= source[j]!) target[k++] = source[i++]!
        else { inversions += mid - i; target[k++] = source[j++]! }
      }
      while (i < mid) target[k++] = source[i++]!
      while (j < hi) target[k++] = source[j++]!
    }
    const swap = source
    source = target
    target = swap
  }
  // `source` is now sorted: count the tied pairs of y from its runs.
  let tiedPairs = 0
  let run = 1
  for (let k = 1; k <= n; k++) {
    if (k < n && source[k] === source[k - 1]) { run++; continue }
    tiedPairs += run * (run - 1) / 2
    run = 1
  }
  const pairs = n * (n - 1) / 2
  if (tiedPairs === pairs) return Number.NaN
  return (pairs - tiedPairs - 2 * inversions) / Math.sqrt(pairs * (pairs - tiedPairs))
}
