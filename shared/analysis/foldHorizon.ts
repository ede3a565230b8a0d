// Fold horizon (docs/science.md §S1.1, §S4.2): near a fold the recovery rate obeys
// k² ∝ (μ_c − μ); with a steadily drifting driver, k² falls linearly in time and reaches zero at
// the fold. A weighted line through the recent k̂² estimates extrapolates to that time.
import { studentTQuantile } from './studentT'

/** One recovery-rate estimate: the window's newest time, the rate and its standard error. */
export interface RatePoint {
  time: number
  rate: number
  se: number
}

export interface FoldHorizonOptions {
  /** Duration of the windows behind the points: overlapping windows are not independent. */
  windowSeconds: number
  /** One-sided significance the falling slope must reach (e.g. 0.01). */
  alpha: number
  /** Two-sided coverage of the band (e.g. 0.9). */
  confidence: number
  /** Time the horizon is measured from (usually the newest point). */
  now: number
}

export type FoldHorizon =
  | {
    kind: 'fold in view'
    /** Projected time at which k² reaches zero, and its band. */
    foldTime: number
    low: number
    high: number
    /** foldTime − now, always > 0 (a line reaching zero earlier is no projection). */
    horizon: number
    /** d(k²)/dt and its standard error. */
    slope: number
    slopeSe: number
  }
  | { kind: 'no fold in view', reason: string }

/**
 * SE of k̂ = −ln(r₁)/Δ from n samples (docs/science.md §S2.3): √((1 − φ²)/n)/(φ·|ln φ|)·k with φ = e^{−kΔ}.
 */
export function recoveryRateSe(rate: number, dt: number, n: number): number {
  const phi = Math.exp(-rate * dt)
  return Math.sqrt((1 - phi * phi) / n) / (phi * dt)
}

/**
 * Weighted least squares of k̂² on time (weights 1/Var(k̂²), Var(k̂²) ≈ (2k·SE(k̂))²), centred on
 * the weighted mean time so intercept and slope are uncorrelated. Standard errors come from the
 * residual scatter, inflated because m points from windows of length W spread over a span S
 * carry only about S/W + 1 independent estimates. The fold time t_c = t̄ − a/b is reported only
 * when the slope is significantly negative; its band is Fieller's interval for the ratio a/b
 * (Fieller 1954 [from memory]), which, unlike the delta method, stays honest when b is imprecise.
 */
export function foldHorizon(points: readonly RatePoint[], options: FoldHorizonOptions): FoldHorizon {
  const usable = points.filter(p => Number.isFinite(p.rate) && p.se > 0)
  if (usable.length < 4) return { kind: 'no fold in view', reason: `${usable.length} usable recovery-rate points, need 4` }
  const fit = weightedLine(usable)
  const span = usable[usable.length - 1]!.time - usable[0]!.time
  const independent = Math.min(usable.length, span / options.windowSeconds + 1)
  if (independent < 3) return { kind: 'no fold in view', reason: 'the points span under two window lengths' }
  const inflation = usable.length / independent
  const varA = fit.varA * inflation
  const varB = fit.varB * inflation
  // A line through about `independent` estimates leaves that many minus two degrees of freedom;
  // with three to six windows the normal quantile would understate both test and band severalfold.
  const df = Math.floor(independent) - 2
  const zSlope = studentTQuantile(1 - options.alpha, df)
  if (!(fit.b < -zSlope * Math.sqrt(varB))) {
    return { kind: 'no fold in view', reason: `the recovery rate² is not falling significantly (slope ${fit.b.toPrecision(3)} ± ${Math.sqrt(varB).toPrecision(3)})` }
  }
  const zBand = studentTQuantile(0.5 + options.confidence / 2, df)
  const band = fiellerBand(fit.a, fit.b, varA, varB, zBand)
  const foldTime = fit.tMean - fit.a / fit.b
  // The newest window still measured a positive recovery rate up to `now`, so a line reaching
  // zero before then contradicts the data it was fitted to (k² curving, not a passed fold): it is
  // no horizon, and reporting "0 min" from it would trip every fold-in-view rule.
  if (foldTime <= options.now) return { kind: 'no fold in view', reason: 'the fitted line reaches zero before the newest estimate, which still recovers' }
  return {
    kind: 'fold in view',
    foldTime,
    low: fit.tMean + band[0],
    high: fit.tMean + band[1],
    horizon: foldTime - options.now,
    slope: fit.b,
    slopeSe: Math.sqrt(varB),
  }
}

interface LineFit { tMean: number, a: number, b: number, varA: number, varB: number }

function weightedLine(points: readonly RatePoint[]): LineFit {
  const y = points.map(p => p.rate * p.rate)
  const observedVar = points.map(p => 4 * p.rate * p.rate * p.se * p.se)
  // Weights from each point's own k̂ favour the points that came out low by chance (Var(k̂²)
  // grows like k³, docs/science.md §S2.3), dragging the line down and the fold early. So the weights are
  // re-evaluated at the fitted k² (iteratively reweighted least squares, two passes), floored at
  // the smallest observed k̂² so a line crossing zero inside the data cannot take all the weight.
  const floor = Math.min(...y.filter(v => v > 0))
  let fit = lineThrough(points, y, y.map(() => 1))
  for (let pass = 0; pass < 2; pass++) {
    const current = fit
    const w = points.map((p, i) => {
      const fitted = Math.max(floor, current.a + current.b * (p.time - current.tMean))
      return 1 / (observedVar[i]! * (fitted / y[i]!) ** 1.5)
    })
    fit = lineThrough(points, y, w)
  }
  return fit
}

function lineThrough(points: readonly RatePoint[], y: readonly number[], w: readonly number[]): LineFit {
  const sw = w.reduce((s, v) => s + v, 0)
  const tMean = points.reduce((s, p, i) => s + w[i]! * p.time, 0) / sw
  const a = y.reduce((s, v, i) => s + w[i]! * v, 0) / sw
  let stt = 0
  let sty = 0
  points.forEach((p, i) => {
    stt += w[i]! * (p.time - tMean) ** 2
    sty += w[i]! * (p.time - tMean) * (y[i]! - a)
  })
  const b = sty / stt
  let chi2 = 0
  points.forEach((p, i) => { chi2 += w[i]! * (y[i]! - a - b * (p.time - tMean)) ** 2 })
  // Scale by the observed scatter, but never claim more precision than the weights promise.
  const scale = Math.max(1, chi2 / (points.length - 2))
  return { tMean, a, b, varA: scale / sw, varB: scale / stt }
}

/** Values s (time − t̄) with (a + b·s)² ≤ z²(Var a + s²·Var b); bounded when b² > z²·Var b. */
function fiellerBand(a: number, b: number, varA: number, varB: number, z: number): [number, number] {
  const qa = b * b - z * z * varB
  const qb = 2 * a * b
  const qc = a * a - z * z * varA
  const root = Math.sqrt(Math.max(0, qb * qb - 4 * qa * qc))
  const s1 = (-qb - root) / (2 * qa)
  const s2 = (-qb + root) / (2 * qa)
  return qa > 0 ? [Math.min(s1, s2), Math.max(s1, s2)] : [Number.NEGATIVE_INFINITY, Number.POSITIVE_INFINITY]
}
