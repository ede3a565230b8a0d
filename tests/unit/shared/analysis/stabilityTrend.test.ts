import { describe, expect, it } from 'vitest'
import { createRng, type Rng } from '#shared/analysis/random'
import { fitStabilityTrend, stabilityTrendTest } from '#shared/analysis/stabilityTrend'
import { binomialBounds } from './support/binomial'

/** x_t = φ(t)·x_{t−1} + e_t, e ~ N(0, 1), started from the stationary law of φ(0) (docs/science.md §S2.3). */
function ar1(n: number, phi: (t: number) => number, rng: Rng): Float64Array {
  const out = new Float64Array(n)
  out[0] = rng.normal() / Math.sqrt(1 - phi(0) ** 2)
  for (let t = 1; t < n; t++) out[t] = phi(t) * out[t - 1]! + rng.normal()
  return out
}

/** s_t of the fit: the window's position from −½ to ½. */
const position = (t: number, n: number) => t / (n - 1) - 0.5

describe('likelihood-ratio statistic under a constant φ', () => {
  // Wilks' theorem: with one extra parameter, LR → χ²₁, whose 95% quantile is 3.841459
  // (standard χ² tables [from memory]). φ = 0.5 is far from the unit root, where it applies.
  it('exceeds the χ²₁ 95% quantile on 5% of 400 seeded AR(1) series (φ = 0.5, n = 900), within binomial bounds', () => {
    const rng = createRng(901)
    const series = 400
    let exceed = 0
    for (let s = 0; s < series; s++) if (fitStabilityTrend(ar1(900, () => 0.5, rng)).lr > 3.841459) exceed++
    const [low, high] = binomialBounds(series, 0.05)
    expect(exceed).toBeGreaterThanOrEqual(low)
    expect(exceed).toBeLessThanOrEqual(high)
  })

  // Monte-Carlo test validity (Davison & Hinkley 1997, via docs/science.md §S3.5): with a fitted
  // null the bootstrap p is ≈ uniform, so p ≤ 0.05 on ≈ 5% of null series, also near the unit
  // root (φ = 0.95) where Wilks' χ²₁ is not trusted. Count ~ Binomial(200, 0.05).
  it.each([0.5, 0.95])('bootstrap p ≤ 0.05 on 1 in 20 of 200 null series (φ = %s, n = 900), within binomial bounds', (phi) => {
    const rng = createRng(phi === 0.5 ? 902 : 903)
    const series = 200
    let rejections = 0
    for (let s = 0; s < series; s++) if (stabilityTrendTest(ar1(900, () => phi, rng), 99, rng).p <= 0.05) rejections++
    const [low, high] = binomialBounds(series, 0.05)
    expect(rejections).toBeGreaterThanOrEqual(low)
    expect(rejections).toBeLessThanOrEqual(high)
  }, 30_000)
})

describe('slope of φ under a known linear drift', () => {
  // φ(t) = 0.5 + 0.4·s_t rises from 0.3 to 0.7 across n = 4000 samples. Asymptotic OLS theory
  // for stationary autoregressions (Hamilton 1994, ch. 8 [from memory]) with E[x²_{t−1}] ≈
  // 1/(1 − φ_t²) (docs/science.md §S2.3, slowly varying φ) gives Var(b̂) = [M⁻¹]₂₂ with
  // M = Σ E[x²]·[[1, s], [s, s²]]: the derived SE below [D].
  const n = 4000
  const truth = 0.4
  const phi = (t: number) => 0.5 + truth * position(t, n)
  let m11 = 0, m12 = 0, m22 = 0
  for (let t = 1; t < n; t++) {
    const ex2 = 1 / (1 - phi(t - 1) ** 2)
    const s = position(t, n)
    m11 += ex2
    m12 += s * ex2
    m22 += s * s * ex2
  }
  const derivedSe = Math.sqrt(m11 / (m11 * m22 - m12 * m12))

  const replicates = 200
  const rng = createRng(904)
  const fits = Array.from({ length: replicates }, () => fitStabilityTrend(ar1(n, phi, rng)))
  const slopes = fits.map(f => f.slope)
  const mean = slopes.reduce((a, b) => a + b, 0) / replicates
  const sd = Math.sqrt(slopes.reduce((a, b) => a + (b - mean) ** 2, 0) / (replicates - 1))

  it('recovers the true slope: mean of 200 fits within 4 derived SE/√200', () => {
    expect(derivedSe).toBeGreaterThan(0.03)
    expect(derivedSe).toBeLessThan(0.08)
    expect(Math.abs(mean - truth)).toBeLessThan(4 * derivedSe / Math.sqrt(replicates))
  })

  // The SD of 200 normal draws has relative SE 1/√(2·199) ≈ 0.05; 15% is three of them.
  it('scatter of the fits and the reported SE both match the derived SE within 15%', () => {
    expect(sd / derivedSe).toBeGreaterThan(0.85)
    expect(sd / derivedSe).toBeLessThan(1.15)
    const meanSe = fits.reduce((a, f) => a + f.slopeSe, 0) / replicates
    expect(meanSe / derivedSe).toBeGreaterThan(0.85)
    expect(meanSe / derivedSe).toBeLessThan(1.15)
  })
})

describe('degenerate windows', () => {
  it('a flat window is no evidence: p = 1', () => {
    const result = stabilityTrendTest(new Float64Array(100).fill(3), 19, createRng(1))
    expect(Number.isNaN(result.fit.lr)).toBe(true)
    expect(result.p).toBe(1)
  })
})
