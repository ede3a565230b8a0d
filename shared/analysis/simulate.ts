// Seeded simulations of the published analytic models (docs/science.md §S1.1, §S2.3), used by the engine's
// own validation, its tests and its detection benchmark. The expected values are analytic.
import type { Rng } from './random'

export interface SampledSeries {
  times: Float64Array
  values: Float64Array
}

export interface OuOptions {
  samples: number
  /** Sample spacing Δ. */
  dt: number
  /** Recovery rate k (may vary with time). */
  k: number | ((t: number) => number)
  /** Noise intensity σ of dX = −k(X − m)dt + σ dW (may vary with time). */
  sigma: number | ((t: number) => number)
  /** Mean level m (may vary with time). */
  mean?: (t: number) => number
}

const valueAt = (f: number | ((t: number) => number), t: number): number => (typeof f === 'number' ? f : f(t))

/**
 * Ornstein–Uhlenbeck process sampled with its exact AR(1) step: φ = e^{−kΔ}, innovation variance
 * σ²(1 − e^{−2kΔ})/(2k) (docs/science.md §S2.3), started from the stationary law N(m, σ²/(2k)).
 */
export function simulateOu(options: OuOptions, rng: Rng): SampledSeries {
  const { samples, dt } = options
  const times = new Float64Array(samples)
  const values = new Float64Array(samples)
  const mean = options.mean ?? (() => 0)
  const k0 = valueAt(options.k, 0)
  let deviation = valueAt(options.sigma, 0) / Math.sqrt(2 * k0) * rng.normal()
  for (let i = 0; i < samples; i++) {
    const t = i * dt
    if (i > 0) {
      const k = valueAt(options.k, t)
      const sigma = valueAt(options.sigma, t)
      const phi = Math.exp(-k * dt)
      deviation = phi * deviation + sigma * Math.sqrt((1 - phi * phi) / (2 * k)) * rng.normal()
    }
    times[i] = t
    values[i] = mean(t) + deviation
  }
  return { times, values }
}

export interface FoldOptions {
  samples: number
  /** Sample spacing Δ. */
  dt: number
  /** Euler–Maruyama steps per sample. */
  substeps: number
  /** Control parameter r(t) of ẋ = r + εx − x². */
  r: (t: number) => number
  epsilon: number
  sigma: number
  /** The state counts as tipped once it falls below this (past the unstable branch). */
  tippedBelow: number
}

export interface FoldRun extends SampledSeries {
  /** Time the state fell below `tippedBelow`, or null if it never did. Samples stop there. */
  tipTime: number | null
}

/**
 * The perturbed fold normal form ẋ = r(t) + εx − x² + σξ (docs/science.md §S1.1), integrated by
 * Euler–Maruyama and started on the stable branch x₊ = (ε + √(ε² + 4r))/2.
 */
export function simulateFold(options: FoldOptions, rng: Rng): FoldRun {
  const { samples, dt, substeps, epsilon, sigma } = options
  const h = dt / substeps
  const noise = sigma * Math.sqrt(h)
  const times: number[] = []
  const values: number[] = []
  let x = (epsilon + Math.sqrt(epsilon * epsilon + 4 * options.r(0))) / 2
  let t = 0
  for (let i = 0; i < samples; i++) {
    times.push(t)
    values.push(x)
    for (let s = 0; s < substeps; s++) {
      x += (options.r(t) + epsilon * x - x * x) * h + noise * rng.normal()
      t += h
      if (x < options.tippedBelow) return { times: Float64Array.from(times), values: Float64Array.from(values), tipTime: t }
    }
    t = (i + 1) * dt
  }
  return { times: Float64Array.from(times), values: Float64Array.from(values), tipTime: null }
}
