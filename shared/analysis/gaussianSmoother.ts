// Nadaraya–Watson smoothing with a Gaussian kernel, renormalised by the weights actually present
// (so the ends are not pulled toward zero): ŝ(t_i) = Σ_j K_ij·y_j / Σ_j K_ij, K_ij = exp(−((t_j − t_i)/σ)²/2).
// docs/science.md §S2.2.
import { fft, inverseFft } from './fft'

/** R `ksmooth(kernel = "normal", bandwidth = bw)` puts the kernel's quartiles at ±bw/4, so σ = 0.25·bw/Φ⁻¹(0.75). */
export const KSMOOTH_SIGMA_PER_BANDWIDTH = 0.25 / 0.6744897501960817

/** The fast smoother ignores weights beyond this many σ. */
export const DEFAULT_TRUNCATION = 4

/** Exact reference: every point weighs on every other. O(n²); for tests and short records. */
export function gaussianSmoothReference(times: ArrayLike<number>, values: ArrayLike<number>, sigma: number): Float64Array {
  checkSigma(sigma)
  const n = values.length
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    let weighted = 0
    let total = 0
    for (let j = 0; j < n; j++) {
      const u = (times[j]! - times[i]!) / sigma
      const w = Math.exp(-0.5 * u * u)
      weighted += w * values[j]!
      total += w
    }
    out[i] = weighted / total
  }
  return out
}

/**
 * The smoother used live: weights beyond ±truncation·σ are dropped, so the cost is
 * O(n·points per 2·truncation·σ). Agreement with the reference: writing the exact value as a
 * mix of the kept and dropped parts, |fast − exact| ≤ (dropped weight / total weight)·(max y − min y).
 * For σ well above the sample spacing the dropped share is at most 2·(1 − Φ(4)) ≈ 6.3e-5 at 4σ
 * (at the ends the kept weight is still ≥ half the kernel, and the dropped tail is one-sided),
 * so |fast − exact| ≤ 6.4e-5·range(y). Evenly spaced samples reuse one table of weights.
 */
export function gaussianSmooth(
  times: ArrayLike<number>, values: ArrayLike<number>, sigma: number, truncation = DEFAULT_TRUNCATION,
): Float64Array {
  checkSigma(sigma)
  const n = values.length
  const out = new Float64Array(n)
  const reach = truncation * sigma
  const table = evenSpacing(times) ? weightTable(times, sigma, reach) : null
  if (table && table.length > FFT_FROM_TAPS) return smoothByFft(values, table)
  let lo = 0
  let hi = 0
  for (let i = 0; i < n; i++) {
    const t = times[i]!
    while (times[lo]! < t - reach) lo++
    while (hi < n && times[hi]! <= t + reach) hi++
    let weighted = 0
    let total = 0
    for (let j = lo; j < hi; j++) {
      const w = table ? (table[Math.abs(j - i)] ?? 0) : kernel((times[j]! - t) / sigma)
      weighted += w * values[j]!
      total += w
    }
    out[i] = weighted / total
  }
  return out
}

/**
 * Beyond this many one-sided taps the sums are taken as a convolution by FFT: O(n log n) instead
 * of O(n · taps). The trend test smooths every window of up to 1,200 samples with ~900 taps at
 * each look, which made the direct sums a third of an evaluation's time.
 */
const FFT_FROM_TAPS = 48

/**
 * The same truncated sums by FFT, values and ones packed as the real and imaginary parts of one
 * signal (the kernel is real and symmetric, so the two convolutions stay apart): the real part is
 * Σ w·y, the imaginary part Σ w over the samples present, and their ratio the renormalised smooth.
 * Values are centred first, so rounding scales with their spread rather than their level.
 */
function smoothByFft(values: ArrayLike<number>, table: Float64Array): Float64Array {
  const n = values.length
  const taps = table.length - 1
  let size = 1
  while (size < n + 2 * taps) size *= 2
  let mean = 0
  for (let i = 0; i < n; i++) mean += values[i]!
  mean /= n
  const signal = { re: new Float64Array(size), im: new Float64Array(size) }
  for (let i = 0; i < n; i++) {
    signal.re[i] = values[i]! - mean
    signal.im[i] = 1
  }
  const weights = { re: new Float64Array(size), im: new Float64Array(size) }
  weights.re[0] = table[0]!
  for (let k = 1; k <= taps; k++) weights.re[k] = weights.re[size - k] = table[k]!
  const a = fft(signal)
  const b = fft(weights)
  for (let k = 0; k < size; k++) {
    const re = a.re[k]! * b.re[k]! - a.im[k]! * b.im[k]!
    a.im[k] = a.re[k]! * b.im[k]! + a.im[k]! * b.re[k]!
    a.re[k] = re
  }
  const sums = inverseFft(a)
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) out[i] = mean + sums.re[i]! / sums.im[i]!
  return out
}

function kernel(u: number): number {
  return Math.exp(-0.5 * u * u)
}

function checkSigma(sigma: number): void {
  if (!(sigma > 0)) throw new RangeError(`kernel bandwidth must be positive, got ${sigma}`)
}

function evenSpacing(times: ArrayLike<number>): boolean {
  const n = times.length
  if (n < 3) return false
  const step = (times[n - 1]! - times[0]!) / (n - 1)
  for (let i = 1; i < n; i++) {
    if (Math.abs(times[i]! - times[i - 1]! - step) > 1e-9 * Math.abs(step)) return false
  }
  return step > 0
}

function weightTable(times: ArrayLike<number>, sigma: number, reach: number): Float64Array {
  const step = (times[times.length - 1]! - times[0]!) / (times.length - 1)
  const size = Math.floor(reach / step) + 1
  const table = new Float64Array(size)
  for (let k = 0; k < size; k++) table[k] = kernel((k * step) / sigma)
  return table
}
