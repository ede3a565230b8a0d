// Rolling lag-1 autocorrelation (NIST r₁) and variance of every window of a series, moved one
// sample at a time, from prefix sums with no per-window objects: the baseline's surrogate loops
// call it some 10⁵ times per run. Same values as shared/analysis/windowTracks.ts
// forEachCountWindow (unit-tested); the series mean is removed first, as there, for precision.

export interface RollingIndicators {
  /** Element k describes samples k … k + window − 1. */
  ar1: Float64Array
  variance: Float64Array
}

export function rollingAr1AndVariance(values: ArrayLike<number>, window: number): RollingIndicators {
  const n = values.length
  const count = Math.max(0, n - window + 1)
  const ar1 = new Float64Array(count)
  const variance = new Float64Array(count)
  if (window < 2 || count === 0) return { ar1, variance }
  let shift = 0
  for (let i = 0; i < n; i++) shift += values[i]!
  shift /= n
  const sum = new Float64Array(n + 1)
  const square = new Float64Array(n + 1)
  // lagged[i + 1] = Σ_{j ≤ i, j ≥ 1} d_j·d_{j−1}
  const lagged = new Float64Array(n + 1)
  let previous = 0
  for (let i = 0; i < n; i++) {
    const d = values[i]! - shift
    sum[i + 1] = sum[i]! + d
    square[i + 1] = square[i]! + d * d
    lagged[i + 1] = lagged[i]! + (i > 0 ? d * previous : 0)
    previous = d
  }
  for (let k = 0; k < count; k++) {
    const end = k + window
    const s1 = sum[end]! - sum[k]!
    const mean = s1 / window
    const centredSquares = square[end]! - square[k]! - s1 * mean
    // Σ over pairs (j, j − 1) inside the window of (d_j − m)(d_{j−1} − m):
    const first = values[k]! - shift
    const last = values[end - 1]! - shift
    const lagProducts = lagged[end]! - lagged[k + 1]!
    const centredLag = lagProducts - mean * ((s1 - first) + (s1 - last)) + (window - 1) * mean * mean
    variance[k] = centredSquares / (window - 1)
    ar1[k] = centredSquares > 0 ? centredLag / centredSquares : Number.NaN
  }
  return { ar1, variance }
}
