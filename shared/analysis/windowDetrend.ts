// The trend test's own detrending (docs/science.md §S2.2): at each look the trend window's raw
// values minus a Gaussian kernel smooth of that window, with a bandwidth that is a share of the
// window's span, as in the published pipeline (Dakos et al. 2012, PLoS ONE 7:e41010, which
// smooths the whole record with R's ksmooth). The causal local-linear filter that feeds the
// rolling indicators follows the data too closely for this job: its end-point fit passes the slow
// fluctuations a loss of stability is made of, and on the detection study's short records the
// stability-trend test then found half the lake-fold approaches it finds on these residuals
// (scripts/bench/earlyWarning.ts; numbers in docs/science.md §S3.5).
import { gaussianSmooth, KSMOOTH_SIGMA_PER_BANDWIDTH } from './gaussianSmoother'

/**
 * Bandwidth as a share of the window's span, in ksmooth's convention. A quarter: half as wide
 * passed a third fewer fold approaches; twice as wide let an accelerating mean (8 SD·(t/T)³)
 * through at α 0.01 on 9 of 100 null records instead of 4.
 */
export const WINDOW_BANDWIDTH_SHARE = 0.25

/** values[start, end) minus their Gaussian kernel smooth over that range. */
export function windowResiduals(
  times: Float64Array, values: Float64Array, start: number, end: number, share = WINDOW_BANDWIDTH_SHARE,
): Float64Array {
  const t = times.subarray(start, end)
  const v = values.subarray(start, end)
  const span = t[t.length - 1]! - t[0]!
  if (!(span > 0)) return new Float64Array(v.length)
  const trend = gaussianSmooth(t, v, share * span * KSMOOTH_SIGMA_PER_BANDWIDTH)
  const out = new Float64Array(v.length)
  for (let i = 0; i < v.length; i++) out[i] = v[i]! - trend[i]!
  return out
}
