// Is the series' stability changing? A likelihood-ratio test of an AR(1) with constant φ against
// one whose φ changes linearly in time (docs/science.md §S3.1: Boettiger & Hastings
// 2012, J R Soc Interface 9:2527). It reads the series directly, so it has no rolling windows
// that lag half a window behind and smear the end of an approach, as Kendall τ of rolling AR1 does.
//
// With Gaussian innovations of constant variance the conditional likelihood is least squares:
//   null         x_t = φ·x_{t−1} + e_t
//   alternative  x_t = (a + b·s_t)·x_{t−1} + e_t,   s_t = t/(n − 1) − ½ ∈ [−½, ½]
// so b is the change of φ across the window and LR = m·ln(RSS₀/RSS₁) over the m = n − 1 pairs.
// Near a unit root Wilks' χ²₁ is unreliable, so p comes from a parametric bootstrap of the null.
//
// Null calibration: a recursive-design wild bootstrap (Gonçalves & Kilian 2004, J Econometrics
// 123:89–120): surrogates are rebuilt from the fitted constant φ with the null model's own
// residuals, each multiplied by a random sign. They keep the data's pattern of innovation size, so
// a step in the noise level (a pump change, a new feed) is part of the null and cannot pass for a
// change of stability; a homoscedastic AR(1) bootstrap rejected such steps far above α.
import { normalUpperTail } from './normal'
import type { Rng } from './random'

export interface StabilityTrendFit {
  /** φ at the window's middle under the alternative. */
  phiMiddle: number
  /** Change of φ from the window's first to its last sample (b). */
  slope: number
  /** OLS standard error of the slope. */
  slopeSe: number
  /** 2·(log-likelihood of the alternative − of the null), ≥ 0. */
  lr: number
  /** sign(b)·√LR: large and positive when φ rises (stability falls). */
  signedRoot: number
}

/**
 * Degree of the polynomial in time that the regression's intercept carries. The mean of a
 * drifting process enters an AR(1) as x_t = (1 − φ)·μ_t + φ·x_{t−1} + e_t, so a quadratic
 * intercept absorbs what a one-sided detrender leaves of a drifting or curving mean (the
 * residual of an accelerating or slowly oscillating mean), which would otherwise change the
 * apparent φ across the window (docs/science.md §S3.1).
 */
export const INTERCEPT_DEGREE = 2 as const

/** Fits both models to `values` (centred first; the intercept polynomial absorbs slow drift). */
export function fitStabilityTrend(values: ArrayLike<number>): StabilityTrendFit {
  const design = pairDesign(values)
  const nan = { phiMiddle: Number.NaN, slope: Number.NaN, slopeSe: Number.NaN, lr: Number.NaN, signedRoot: Number.NaN }
  if (!design) return nan
  const k = design.columns
  const full = solveNormal(design.xtx, design.xty, k)
  const reduced = solveNormal(design.xtx, design.xty, k - 1)
  if (!full || !reduced) return nan
  const m = design.pairs
  const rss1 = Math.max(design.yty - full.explained, 0)
  const rss0 = Math.max(design.yty - reduced.explained, 0)
  const lr = rss1 > 0 && rss0 > rss1 ? m * Math.log(rss0 / rss1) : 0
  const b = full.beta[k - 1]!
  return {
    phiMiddle: full.beta[k - 2]!,
    slope: b,
    slopeSe: Math.sqrt((rss1 / (m - k)) * full.inverseDiagonalLast),
    lr,
    signedRoot: Math.sign(b) * Math.sqrt(lr),
  }
}

interface PairDesign {
  /** Regressors per pair: 1, s, …, s^d, x_{t−1}, s·x_{t−1}; s = t/(n − 1) − ½. */
  columns: number
  pairs: number
  xtx: Float64Array
  xty: Float64Array
  yty: number
}

function pairDesign(values: ArrayLike<number>): PairDesign | null {
  const n = values.length
  const k = INTERCEPT_DEGREE + 3
  if (n < k + 3) return null
  let mean = 0
  for (let i = 0; i < n; i++) mean += values[i]!
  mean /= n
  // The regressors are 1, s, s², x, s·x (INTERCEPT_DEGREE = 2), so the normal equations need the
  // sums below; the ones of s alone depend only on n. Written out because this runs for every
  // bootstrap series of every evaluation: the tick's hottest loop.
  const powers = sPowerSums(n)
  let sx = 0, ssx = 0, s2x = 0, s3x = 0, xx = 0, sxx = 0, s2xx = 0
  let y1 = 0, sy = 0, s2y = 0, xy = 0, sxy = 0, yy = 0
  let x = values[0]! - mean
  const scale = 1 / (n - 1)
  for (let t = 1; t < n; t++) {
    const y = values[t]! - mean
    const s1 = t * scale - 0.5
    const s2 = s1 * s1
    const xs = x * s1
    sx += x
    ssx += xs
    s2x += x * s2
    s3x += xs * s2
    xx += x * x
    sxx += xs * x
    s2xx += xs * xs
    y1 += y
    sy += s1 * y
    s2y += s2 * y
    xy += x * y
    sxy += xs * y
    yy += y * y
    x = y
  }
  const xtx = Float64Array.from([
    powers[0]!, powers[1]!, powers[2]!, sx, ssx,
    powers[1]!, powers[2]!, powers[3]!, ssx, s2x,
    powers[2]!, powers[3]!, powers[4]!, s2x, s3x,
    sx, ssx, s2x, xx, sxx,
    ssx, s2x, s3x, sxx, s2xx,
  ])
  return { columns: k, pairs: n - 1, xtx, xty: Float64Array.from([y1, sy, s2y, xy, sxy]), yty: yy }
}

/** Σ s^p over the pairs t = 1 … n − 1, p = 0 … 4, cached by n (the same n repeats every tick). */
const powerSumCache = new Map<number, Float64Array>()
function sPowerSums(n: number): Float64Array {
  let sums = powerSumCache.get(n)
  if (sums) return sums
  sums = new Float64Array(5)
  for (let t = 1; t < n; t++) {
    const s = t / (n - 1) - 0.5
    let power = 1
    for (let p = 0; p < 5; p++) {
      sums[p] = sums[p]! + power
      power *= s
    }
  }
  if (powerSumCache.size > 64) powerSumCache.clear()
  powerSumCache.set(n, sums)
  return sums
}

/**
 * Least squares on the first `size` columns by Cholesky of the normal equations (a handful of
 * columns, well scaled: s ∈ [−½, ½] and centred values). Returns β, β'X'y and [(X'X)⁻¹]_last.
 */
function solveNormal(
  xtx: Float64Array, xty: Float64Array, size: number,
): { beta: Float64Array, explained: number, inverseDiagonalLast: number } | null {
  const k = Math.round(Math.sqrt(xtx.length))
  const l = new Float64Array(size * size)
  for (let i = 0; i < size; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = xtx[i * k + j]!
      for (let p = 0; p < j; p++) sum -= l[i * size + p]! * l[j * size + p]!
      if (i === j) {
        if (!(sum > 1e-12 * xtx[i * k + i]!)) return null
        l[i * size + i] = Math.sqrt(sum)
      }
      else l[i * size + j] = sum / l[j * size + j]!
    }
  }
  const forward = (rhs: Float64Array) => {
    const out = new Float64Array(size)
    for (let i = 0; i < size; i++) {
      let sum = rhs[i]!
      for (let p = 0; p < i; p++) sum -= l[i * size + p]! * out[p]!
      out[i] = sum / l[i * size + i]!
    }
    return out
  }
  const back = (rhs: Float64Array) => {
    const out = new Float64Array(size)
    for (let i = size - 1; i >= 0; i--) {
      let sum = rhs[i]!
      for (let p = i + 1; p < size; p++) sum -= l[p * size + i]! * out[p]!
      out[i] = sum / l[i * size + i]!
    }
    return out
  }
  const beta = back(forward(xty.subarray(0, size)))
  let explained = 0
  for (let i = 0; i < size; i++) explained += beta[i]! * xty[i]!
  // [(X'X)⁻¹]_last,last = ‖L⁻¹ e_last‖², and L⁻¹ e_last is zero except its last entry.
  const inverseDiagonalLast = 1 / l[(size - 1) * size + size - 1]! ** 2
  return { beta, explained, inverseDiagonalLast }
}

export interface StabilityTrendTest {
  fit: StabilityTrendFit
  /**
   * One-sided p for rising φ: the signed root z against the normal fitted to its bootstrap
   * distribution (mean and SD of z*; Efron & Tibshirani 1993, ch. 6 [from memory]). Under the
   * null z is close to normal (Wilks), and the fitted tail resolves p far below the 1/(N + 1)
   * floor of a Monte-Carlo count, which a tag re-tested every few seconds for years needs.
   */
  p: number
  /** Monte-Carlo p = (1 + #{z* ≥ z})/(N + 1) (Davison & Hinkley 1997), for reference. */
  pMonteCarlo: number
  surrogates: number
}

/** One-sided test for rising φ: the signed root of LR against its wild-bootstrap distribution. */
export function stabilityTrendTest(values: ArrayLike<number>, surrogates: number, rng: Rng): StabilityTrendTest {
  const fit = fitStabilityTrend(values)
  // A degenerate window (flat or too short) is no evidence at all.
  if (!Number.isFinite(fit.signedRoot)) return { fit, p: 1, pMonteCarlo: 1, surrogates }
  const generate = wildBootstrapGenerator(values)
  let exceedances = 0
  let count = 0, sum = 0, sumSquares = 0
  for (let k = 0; k < surrogates; k++) {
    const z = fitStabilityTrend(generate(rng)).signedRoot
    // A NaN statistic (a flat surrogate) can never count as at least as extreme.
    if (!Number.isFinite(z)) continue
    if (z >= fit.signedRoot) exceedances++
    count++
    sum += z
    sumSquares += z * z
  }
  const pMonteCarlo = (1 + exceedances) / (surrogates + 1)
  if (count < 2) return { fit, p: pMonteCarlo, pMonteCarlo, surrogates }
  const mean = sum / count
  const sd = Math.sqrt(Math.max((sumSquares - count * mean * mean) / (count - 1), 1e-12))
  return { fit, p: normalUpperTail((fit.signedRoot - mean) / sd), pMonteCarlo, surrogates }
}

/**
 * Surrogates x*_t = c(s_t) + φ̂·x*_{t−1} + η_t·ê_t under the constant-φ fit (its intercept
 * polynomial c included), with ê the fitted residuals and η = ±1 at random (Rademacher weights).
 * The first value is kept, as the recursive design does.
 */
function wildBootstrapGenerator(values: ArrayLike<number>): (rng: Rng) => Float64Array {
  const n = values.length
  let mean = 0
  for (let i = 0; i < n; i++) mean += values[i]!
  mean /= n
  const design = pairDesign(values)!
  const k = design.columns
  const beta = solveNormal(design.xtx, design.xty, k - 1)!.beta
  // Capped below 1: a fitted unit root would let the surrogates wander without bound.
  const phi = Math.max(-0.999, Math.min(0.999, beta[k - 2]!))
  const intercept = new Float64Array(n)
  const residuals = new Float64Array(n)
  for (let t = 1; t < n; t++) {
    const s = t / (n - 1) - 0.5
    let c = 0
    let power = 1
    for (let d = 0; d <= INTERCEPT_DEGREE; d++) {
      c += beta[d]! * power
      power *= s
    }
    intercept[t] = c
    residuals[t] = (values[t]! - mean) - c - beta[k - 2]! * (values[t - 1]! - mean)
  }
  return (rng) => {
    const out = new Float64Array(n)
    let x = values[0]! - mean
    out[0] = x
    for (let t = 1; t < n; t++) {
      x = intercept[t]! + phi * x + (rng.uniform() < 0.5 ? -residuals[t]! : residuals[t]!)
      out[t] = x
    }
    return out
  }
}
