// Surrogate series under a stationary null (docs/science.md §S3.4): same length and roughly the
// same variance and memory as the data, but no change of stability.
import { fft, inverseFft } from './fft'
import { centredSums } from './moments'
import type { Rng } from './random'

/** Makes one surrogate series per call. */
export type SurrogateGenerator = (rng: Rng) => Float64Array

/** Which stationary null the surrogates follow. */
export type SurrogateKind = 'ar1' | 'phase' | 'shuffle'

/** A generator of `kind` fitted to `values`. */
export function surrogateGenerator(kind: SurrogateKind, values: ArrayLike<number>): SurrogateGenerator {
  switch (kind) {
    case 'ar1': return ar1SurrogateGenerator(values)
    case 'phase': return phaseSurrogateGenerator(values)
    case 'shuffle': return shuffleSurrogateGenerator(values)
  }
}

/** An AR(1) fitted by its moments (mean, variance, NIST r₁, docs/science.md §S2.3) to the data. */
export interface Ar1Fit {
  mean: number
  variance: number
  phi: number
}

/** Fits an AR(1) by the sample mean, variance (n − 1) and lag-1 autocorrelation r₁. */
export function fitAr1(values: ArrayLike<number>): Ar1Fit {
  const sums = centredSums(values)
  const phi = sums.sum2 > 0 ? sums.lagSum / sums.sum2 : 0
  return { mean: sums.mean, variance: sums.sum2 / (sums.n - 1), phi }
}

/**
 * AR(1) surrogates, started from the stationary law so no warm-up transient can pass for a trend.
 * |φ| is capped below 1 because a fitted unit root would have no stationary variance.
 */
export function ar1SurrogateGenerator(values: ArrayLike<number>): SurrogateGenerator {
  const fit = fitAr1(values)
  const phi = Math.max(-0.999, Math.min(0.999, fit.phi))
  const sd = Math.sqrt(fit.variance)
  const innovationSd = sd * Math.sqrt(1 - phi * phi)
  const n = values.length
  return (rng) => {
    const out = new Float64Array(n)
    let x = sd * rng.normal()
    for (let i = 0; i < n; i++) {
      if (i > 0) x = phi * x + innovationSd * rng.normal()
      out[i] = fit.mean + x
    }
    return out
  }
}

/**
 * Phase-randomised Fourier surrogates (Theiler et al. 1992): the amplitude spectrum of the data
 * is kept, every phase is drawn uniformly on [0, 2π) with Hermitian symmetry so the result is
 * real; the zero-frequency (and for even n the Nyquist) term keeps its own phase.
 */
export function phaseSurrogateGenerator(values: ArrayLike<number>): SurrogateGenerator {
  const n = values.length
  const spectrum = fft({ re: Float64Array.from(values), im: new Float64Array(n) })
  const amplitude = spectrum.re.map((re, k) => Math.hypot(re, spectrum.im[k]!))
  return (rng) => {
    const re = new Float64Array(n)
    const im = new Float64Array(n)
    re[0] = spectrum.re[0]!
    for (let k = 1; k <= Math.floor((n - 1) / 2); k++) {
      const phase = 2 * Math.PI * rng.uniform()
      re[k] = amplitude[k]! * Math.cos(phase)
      im[k] = amplitude[k]! * Math.sin(phase)
      re[n - k] = re[k]!
      im[n - k] = -im[k]!
    }
    if (n % 2 === 0) re[n / 2] = spectrum.re[n / 2]!
    return inverseFft({ re, im }).re
  }
}

/** Random permutations (Fisher–Yates): keeps the distribution, destroys all memory. */
export function shuffleSurrogateGenerator(values: ArrayLike<number>): SurrogateGenerator {
  const source = Float64Array.from(values)
  return (rng) => {
    const out = Float64Array.from(source)
    for (let i = out.length - 1; i > 0; i--) {
      const j = rng.integer(i + 1)
      const swap = out[i]!
      out[i] = out[j]!
      out[j] = swap
    }
    return out
  }
}
