// Time to the fold from a time-varying AR(1) fitted by likelihood (docs/science.md §S4.1,
// §S1.1; Boettiger & Hastings 2012, J R Soc Interface 9:2527, fit the fold's
// stability change directly; Thompson & Sieber 2011, IMA J Appl Math 76:27, the normal-form rate).
//
// Near a fold driven linearly in time the recovery rate follows λ(t)² = c·(t_c − t) (square-root
// law); near a transcritical exchange λ(t) = c·(t_c − t). So the window's residuals are fitted as
//   x_j = exp(−κ·Δ·(t_c − t_j)^p)·x_{j−1} + e_j,   p ∈ {½, 1}
// by least squares (the Gaussian conditional likelihood). For each candidate t_c the rate scale κ
// is profiled out (Gauss–Newton), and the profile deviance m·ln(RSS(t_c)/RSS_min) against χ²₁
// gives the band. The constant-rate AR(1) is the limit t_c → ∞: when the data do not beat it, or
// the band reaches the far end of the grid, there is no fold in view.
//
// Why not a line through λ² of rolling windows: a handful of overlapping windows leave almost no
// degrees of freedom, and a line through the convex λ²(t) of an approach crossed zero "before
// now" and was dropped; the pairwise likelihood uses every sample once.

export type FoldProfile =
  | { kind: 'fold in view', foldTime: number, low: number, high: number, shape: 'square root' | 'linear' }
  | { kind: 'none', reason: string }

export interface FoldProfileOptions {
  /** Coverage of the band (χ²₁ quantile of the profile deviance). */
  confidence: 0.8 | 0.9 | 0.95
}

/** χ²₁ quantiles (standard tables [from memory]; χ²₁(q) = Φ⁻¹((1 + q)/2)²). */
const CHI2_1: Record<FoldProfileOptions['confidence'], number> = { 0.8: 1.642374, 0.9: 2.705543, 0.95: 3.841459 }

/** Candidate fold times, from just after now to 20 window spans ahead (geometric). */
const GRID_POINTS = 32
const GRID_NEAREST = 0.005
const GRID_FARTHEST = 20
const SHAPES = [{ power: 0.5, name: 'square root' }, { power: 1, name: 'linear' }] as const
const GAUSS_NEWTON_STEPS = 4

/** Fits the fold time to detrended residuals `values` sampled at `times` (s, ascending). */
export function foldProfile(times: ArrayLike<number>, values: ArrayLike<number>, options: FoldProfileOptions): FoldProfile {
  const n = values.length
  if (n < 30) return { kind: 'none', reason: 'too few samples' }
  const now = times[n - 1]!
  const span = now - times[0]!
  const dt = span / (n - 1)
  const pairs = pairsOf(times, values)
  if (!(pairs.sxx > 0)) return { kind: 'none', reason: 'flat window' }
  const rssConstant = pairs.syy - pairs.sxy * pairs.sxy / pairs.sxx
  const grid = Array.from({ length: GRID_POINTS },
    (_, i) => now + span * GRID_NEAREST * (GRID_FARTHEST / GRID_NEAREST) ** (i / (GRID_POINTS - 1)))
  const phi0 = Math.min(0.999, Math.max(0.01, pairs.sxy / pairs.sxx))
  const profile = grid.map(() => ({ rss: Number.POSITIVE_INFINITY, shape: SHAPES[0].name as FoldProfileShape }))
  for (const shape of SHAPES) {
    let kappa = Number.NaN
    grid.forEach((foldTime, g) => {
      kappa = fitRateScale(pairs, foldTime, shape.power, dt, Number.isFinite(kappa) ? kappa : Number.NaN, phi0)
      const rss = residualSum(pairs, foldTime, shape.power, dt, kappa)
      if (rss < profile[g]!.rss) profile[g] = { rss, shape: shape.name }
    })
  }
  let best = 0
  for (let g = 1; g < GRID_POINTS; g++) if (profile[g]!.rss < profile[best]!.rss) best = g
  const m = pairs.count
  const deviance = (rss: number) => m * Math.log(rss / profile[best]!.rss)
  const threshold = CHI2_1[options.confidence]
  if (!(deviance(rssConstant) > threshold)) return { kind: 'none', reason: 'a constant recovery rate fits as well' }
  let hi = best
  while (hi < GRID_POINTS - 1 && deviance(profile[hi + 1]!.rss) <= threshold) hi++
  if (hi === GRID_POINTS - 1) return { kind: 'none', reason: 'the band reaches beyond the horizon the data support' }
  let lo = best
  while (lo > 0 && deviance(profile[lo - 1]!.rss) <= threshold) lo--
  // Band edges interpolated between grid points where the deviance crosses the threshold.
  const edge = (inside: number, outside: number) => {
    const dIn = deviance(profile[inside]!.rss)
    const dOut = deviance(profile[outside]!.rss)
    const f = dOut > dIn ? (threshold - dIn) / (dOut - dIn) : 0
    return grid[inside]! + f * (grid[outside]! - grid[inside]!)
  }
  return {
    kind: 'fold in view',
    foldTime: grid[best]!,
    low: lo > 0 ? edge(lo, lo - 1) : now,
    high: edge(hi, hi + 1),
    shape: profile[best]!.shape,
  }
}

type FoldProfileShape = (typeof SHAPES)[number]['name']

interface Pairs {
  /** Time of each pair's step (s), previous and current centred values. */
  t: Float64Array
  x: Float64Array
  y: Float64Array
  count: number
  sxx: number
  sxy: number
  syy: number
}

function pairsOf(times: ArrayLike<number>, values: ArrayLike<number>): Pairs {
  const n = values.length
  let mean = 0
  for (let i = 0; i < n; i++) mean += values[i]!
  mean /= n
  const m = n - 1
  const t = new Float64Array(m)
  const x = new Float64Array(m)
  const y = new Float64Array(m)
  let sxx = 0, sxy = 0, syy = 0
  for (let j = 0; j < m; j++) {
    // The rate acts over the step from j to j + 1: label it at the step's middle.
    t[j] = (times[j]! + times[j + 1]!) / 2
    x[j] = values[j]! - mean
    y[j] = values[j + 1]! - mean
    sxx += x[j]! * x[j]!
    sxy += x[j]! * y[j]!
    syy += y[j]! * y[j]!
  }
  return { t, x, y, count: m, sxx, sxy, syy }
}

/** κ minimising Σ(y − e^{−κg}x)², g = Δ·(t_c − t)^p, by Gauss–Newton from a warm start. */
function fitRateScale(pairs: Pairs, foldTime: number, power: number, dt: number, start: number, phi0: number): number {
  let kappa = start
  if (!Number.isFinite(kappa) || !(kappa > 0)) {
    // Cold start: the κ whose mean rate reproduces the constant-φ fit.
    let gMean = 0
    for (let j = 0; j < pairs.count; j++) gMean += dt * (foldTime - pairs.t[j]!) ** power
    kappa = -Math.log(phi0) / (gMean / pairs.count)
  }
  for (let step = 0; step < GAUSS_NEWTON_STEPS; step++) {
    let num = 0, den = 0
    for (let j = 0; j < pairs.count; j++) {
      const g = dt * (foldTime - pairs.t[j]!) ** power
      const f = Math.exp(-kappa * g) * pairs.x[j]!
      const d = g * f // ∂r/∂κ for r = y − f
      num += d * (pairs.y[j]! - f)
      den += d * d
    }
    if (!(den > 0)) break
    const next = kappa - num / den
    // Halve towards zero instead of stepping to a negative (exploding) rate.
    kappa = next > 0 ? next : kappa / 2
  }
  return kappa
}

function residualSum(pairs: Pairs, foldTime: number, power: number, dt: number, kappa: number): number {
  let rss = 0
  for (let j = 0; j < pairs.count; j++) {
    const r = pairs.y[j]! - Math.exp(-kappa * dt * (foldTime - pairs.t[j]!) ** power) * pairs.x[j]!
    rss += r * r
  }
  return rss
}
