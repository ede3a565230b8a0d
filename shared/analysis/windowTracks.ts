// Indicators of every count window of a series from prefix sums: O(1) per window after one O(n)
// pass, with no ring buffer. The surrogate test evaluates hundreds of series per decision, so this
// is its inner loop; the live per-tag state stays in RollingWindow.
import { indicatorsFromSums } from './indicators'
import { accurateMean, centredFromShifted } from './moments'
import type { Indicators } from './types'

/**
 * Calls `visit` with the indicators of values[end − window, end) for end = window, window + step, …
 * (the window's newest sample index is end − 1). Sums are about the series mean, so each window
 * keeps the precision argument of `centredFromShifted` as long as the series has no large trend.
 */
export function forEachCountWindow(
  times: ArrayLike<number>, values: ArrayLike<number>, window: number, step: number,
  visit: (indicators: Indicators, newest: number) => void,
): void {
  const n = values.length
  if (window < 2 || window > n) return
  const shift = accurateMean(values)
  const p1 = new Float64Array(n + 1)
  const p2 = new Float64Array(n + 1)
  const p3 = new Float64Array(n + 1)
  const p4 = new Float64Array(n + 1)
  const lag = new Float64Array(n + 1)
  for (let i = 0; i < n; i++) {
    const d = values[i]! - shift
    const d2 = d * d
    p1[i + 1] = p1[i]! + d
    p2[i + 1] = p2[i]! + d2
    p3[i + 1] = p3[i]! + d2 * d
    p4[i + 1] = p4[i]! + d2 * d2
    lag[i + 1] = lag[i]! + (i > 0 ? d * (values[i - 1]! - shift) : 0)
  }
  for (let end = window; end <= n; end += step) {
    const start = end - window
    const sums = centredFromShifted({
      n: window,
      shift,
      s1: p1[end]! - p1[start]!,
      s2: p2[end]! - p2[start]!,
      s3: p3[end]! - p3[start]!,
      s4: p4[end]! - p4[start]!,
      // Pairs (i, i − 1) with both inside the window: i from start + 1 to end − 1.
      lag: lag[end]! - lag[start + 1]!,
      first: values[start]! - shift,
      last: values[end - 1]! - shift,
    })
    const dt = (times[end - 1]! - times[start]!) / (window - 1)
    visit(indicatorsFromSums(sums, { dt, levelMean: sums.mean }), end - 1)
  }
}
