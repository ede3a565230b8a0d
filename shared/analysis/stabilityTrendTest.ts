// Is the series' stability changing? A likelihood-ratio test of an AR(1) with constant φ against
// one whose φ changes linearly in time (SCIENCE.md A3 cautions, A5 item 14: Boettiger & Hastings
// 2012, J R Soc Interface 9:2527). It reads the series directly, so it has no rolling windows
// that lag half a window behind and smear the end of an approach, as Kendall τ of rolling AR1 does.
//
// With Gaussian innovations of constant variance the conditional likelihood is least squares:
//   null         x_t = φ·x_{t−1} + e_t
//   alternative  x_t = (a + b·s_t)·x_{t−1} + e_t,   s_t = t/(n − 1) − ½ ∈ [−½, ½]
// so b is the change of φ across the window and LR = m·ln(RSS₀/RSS₁) over the m = n − 1 pairs.
// Near a unit root Wilks' χ²₁ is unreliable, so p comes from a parametric bootstrap of the null.
//
// Not yet in the live path. Whole-procedure study (scripts/bench/detection.ts, same seeds, on-delay
// 3, α 0.01, 99 bootstrap series; this test's p ≤ α with a non-falling variance replacing the τ
// evidence), detections before the tip for cstr / digester / grid of 6 runs each, normal form of 8,
// and slowing-down alerts over 72 null tag-weeks (steady unit + three OU scenarios):
//   τ of rolling AR1 (live today)     1 / 2 / 5, 2   nulls 1 (0.014 per tag-week, ≤ 0.197 at 95%)
//   this test on the 900-sample trend window   2 / 3 / 6, 2   nulls 2
//   this test on the last 1,800 samples       5 / 3 / 6, 6   nulls 1 (cstr lead 2 min, normal form 16.6 h)
// The gain comes with the longer window, which the live loader does not yet fetch (it loads the
// trend window plus detrending warm-up), and doubles the bootstrap's cost per evaluation.
import type { Rng } from './random'
import { ar1SurrogateGenerator } from './surrogates'

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

/** Fits both models to `values` about their mean (the residuals are already detrended). */
export function fitStabilityTrend(values: ArrayLike<number>): StabilityTrendFit {
  const n = values.length
  let mean = 0
  for (let i = 0; i < n; i++) mean += values[i]!
  mean /= n
  // Sums over pairs (x = x_{t−1}, y = x_t, u = s·x): enough for both fits in one pass.
  let sxx = 0, sxu = 0, suu = 0, sxy = 0, suy = 0, syy = 0
  let previous = values[0]! - mean
  for (let t = 1; t < n; t++) {
    const current = values[t]! - mean
    const s = t / (n - 1) - 0.5
    const xx = previous * previous
    sxx += xx
    sxu += s * xx
    suu += s * s * xx
    sxy += previous * current
    suy += s * previous * current
    syy += current * current
    previous = current
  }
  const m = n - 1
  const det = sxx * suu - sxu * sxu
  if (!(sxx > 0) || !(det > 0)) return { phiMiddle: Number.NaN, slope: Number.NaN, slopeSe: Number.NaN, lr: Number.NaN, signedRoot: Number.NaN }
  const rss0 = syy - (sxy * sxy) / sxx
  const a = (suu * sxy - sxu * suy) / det
  const b = (sxx * suy - sxu * sxy) / det
  const rss1 = Math.max(syy - (a * sxy + b * suy), 0)
  const lr = rss1 > 0 && rss0 > rss1 ? m * Math.log(rss0 / rss1) : 0
  return {
    phiMiddle: a,
    slope: b,
    slopeSe: Math.sqrt((rss1 / (m - 2)) * sxx / det),
    lr,
    signedRoot: Math.sign(b) * Math.sqrt(lr),
  }
}

export interface StabilityTrendTest {
  fit: StabilityTrendFit
  /** Monte-Carlo p = (1 + #{z* ≥ z})/(N + 1) for rising φ, z the signed root (Davison & Hinkley 1997). */
  p: number
  surrogates: number
}

/**
 * One-sided test for rising φ: the signed root of LR against its distribution over AR(1) series
 * fitted to the data under the null (parametric bootstrap, as Boettiger & Hastings calibrate it).
 */
export function stabilityTrendTest(values: ArrayLike<number>, surrogates: number, rng: Rng): StabilityTrendTest {
  const fit = fitStabilityTrend(values)
  // A degenerate window (flat or too short) is no evidence at all.
  if (!Number.isFinite(fit.signedRoot)) return { fit, p: 1, surrogates }
  const generate = ar1SurrogateGenerator(values)
  let exceedances = 0
  for (let k = 0; k < surrogates; k++) {
    // A NaN statistic (a flat surrogate) can never count as at least as extreme.
    if (fitStabilityTrend(generate(rng)).signedRoot >= fit.signedRoot) exceedances++
  }
  return { fit, p: (1 + exceedances) / (surrogates + 1), surrogates }
}
