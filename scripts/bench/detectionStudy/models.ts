// The published models the detection benchmark ramps to their bifurcation. Every critical value
// and equilibrium is computed numerically here; parameters recalled from papers are marked.
import { argMax, bisect, derivative } from './numerics'

export interface BenchModel {
  name: string
  /** Where the model comes from; recalled values are marked [from memory]. */
  source: string
  bifurcation: 'fold' | 'transcritical'
  /** Deterministic part of dx = drift(x, p)·dt + σ·dW. */
  drift: (x: number, p: number) => number
  sigma: number
  /** Control parameter at the start of the ramp, and of the fixed-parameter null. */
  p0: number
  /** Where the monitored equilibrium loses stability (computed, not recalled). */
  critical: number
  /** The monitored stable equilibrium at p (for p short of `critical`). */
  equilibrium: (p: number) => number
  /** True once the state has left the monitored basin for good: the record ends there. */
  hasTipped: (x: number) => boolean
}

/** Linearised rate λ = ∂f/∂x at the monitored equilibrium; negative while it is stable. */
export function eigenvalue(model: BenchModel, p: number): number {
  return derivative(x => model.drift(x, p), model.equilibrium(p))
}

/** 1/|λ| at the ramp start: the unit in which "how far before the tip the data stop" is drawn. */
export function characteristicTime(model: BenchModel): number {
  return 1 / Math.abs(eigenvalue(model, model.p0))
}

/**
 * May's harvesting model dx = [r·x(1 − x/K) − h·x²/(s² + x²)]dt + σdW (May 1977, Nature
 * 269:471–477), with r = 1, K = 1, s = 0.1, h from 0.15 and σ = 0.01 as in Bury et al. 2021
 * (PNAS 118:e2106140118) [from memory]. Equilibria solve h = H(x) = r(1 − x/K)(s² + x²)/x; the
 * upper branch ends where H peaks (the fold), which is found by golden section.
 */
function mayHarvesting(): BenchModel {
  const r = 1, K = 1, s = 0.1
  const drift = (x: number, h: number) => r * x * (1 - x / K) - h * x * x / (s * s + x * x)
  const harvestOnBranch = (x: number) => r * (1 - x / K) * (s * s + x * x) / x
  // H falls from +∞ to a local minimum near x ≈ s, then peaks once before reaching 0 at K.
  const foldState = argMax(harvestOnBranch, 1.5 * s, K)
  return {
    name: 'May harvesting (fold)',
    source: 'May 1977 Nature 269:471; r=1 K=1 s=0.1 σ=0.01 h from 0.15 as Bury et al. 2021 PNAS 118:e2106140118 [from memory]',
    bifurcation: 'fold',
    drift,
    sigma: 0.01,
    p0: 0.15,
    critical: harvestOnBranch(foldState),
    // Between the fold state and K the drift changes sign once: the upper equilibrium.
    equilibrium: h => bisect(x => drift(x, h), foldState, K),
    // The lower (overharvested) state lies near x ≈ 0.05; below 0.2 the upper basin is left.
    hasTipped: x => x < 0.2,
  }
}

/**
 * Lake phosphorus dx = [a − b·x + r·x^q/(1 + x^q)]dt + σdW (Carpenter, Ludwig & Brock 1999,
 * Ecol Appl 9:751–771; q = 8, b = r = 1 as in Carpenter & Brock 2006, Ecol Lett 9:311–318
 * [from memory]); a (loading) is ramped from 0.3 until the oligotrophic branch ends, σ = 0.01
[our choices: at σ = 0.02, 7 of 10 long ramps tipped by noise over 40τ before the fold].
 * Equilibria solve a = g(x) = b·x − r·x^q/(1 + x^q); that branch ends where g first peaks.
 */
function lakePhosphorus(): BenchModel {
  const b = 1, r = 1
  const recycling = (x: number) => { const x8 = (x * x) ** 4; return r * x8 / (1 + x8) }
  const drift = (x: number, a: number) => a - b * x + recycling(x)
  const loadingOnBranch = (x: number) => b * x - recycling(x)
  // g rises from 0, peaks once below x = 1 (g'(1) = b − 2r < 0), then dips and rises again.
  const foldState = argMax(loadingOnBranch, 0, 1)
  return {
    name: 'lake phosphorus (fold)',
    source: 'Carpenter, Ludwig & Brock 1999 Ecol Appl 9:751; q=8 b=r=1 as Carpenter & Brock 2006 Ecol Lett 9:311 [from memory]; a from 0.3, σ=0.01 [our choice]',
    bifurcation: 'fold',
    drift,
    sigma: 0.01,
    p0: 0.3,
    critical: loadingOnBranch(foldState),
    equilibrium: a => bisect(x => drift(x, a), 0, foldState),
    // The eutrophic branch lies above x ≈ 1.5 and the saddle below 1.0 along the ramp.
    hasTipped: x => x > 1.2,
  }
}

/**
 * Transcritical normal form dx = (μ·x − x²)dt + σdW (Strogatz 1994, Nonlinear Dynamics and Chaos,
 * Addison-Wesley; slow passage analysed by Kuehn 2011, Physica D 240:1020–1035 [from memory]),
 * μ ramped from −1 to 0. x = 0 is an equilibrium for every μ and loses stability where λ(μ) = μ
 * crosses zero (found by bisection). Additive noise can carry x below the saddle x = μ, after
 * which it runs away to −∞; the basin shrinks with |μ|, so σ is kept small, 0.002 [our choice:
 * at 0.01 every long ramp, at 0.005 7 of 10, escaped 200–900 s before μ = 0]. Records that
 * escape anyway end there, as a fold's would.
 */
function transcritical(): BenchModel {
  const drift = (x: number, mu: number) => mu * x - x * x
  return {
    name: 'transcritical normal form',
    source: 'Strogatz 1994 (book); slow passage Kuehn 2011 Physica D 240:1020 [from memory]; μ from −1, σ=0.002 [our choice]',
    bifurcation: 'transcritical',
    drift,
    sigma: 0.002,
    p0: -1,
    critical: bisect(mu => derivative(x => drift(x, mu), 0), -1, 1),
    equilibrium: () => 0,
    // Below every saddle of the ramp (x = μ ≥ −1), so nothing short of runaway counts.
    hasTipped: x => x < -1.5 || !Number.isFinite(x),
  }
}

export const BENCH_MODELS: readonly BenchModel[] = [mayHarvesting(), lakePhosphorus(), transcritical()]
