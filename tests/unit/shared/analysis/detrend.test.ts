import { describe, expect, it } from 'vitest'
import { linearRegression } from 'simple-statistics'
import { causalLocalLinearTrend, detrend, linearTrend } from '#shared/analysis/detrend'
import { gaussianSmooth, gaussianSmoothReference, KSMOOTH_SIGMA_PER_BANDWIDTH } from '#shared/analysis/gaussianSmoother'
import { normalQuantile } from '#shared/analysis/normal'
import { createRng } from '#shared/analysis/random'

const maxAbsDiff = (a: ArrayLike<number>, b: ArrayLike<number>): number =>
  Array.from(a).reduce((worst, v, i) => Math.max(worst, Math.abs(v - b[i]!)), 0)

describe('Gaussian kernel smoother (Nadaraya–Watson, renormalised at the ends)', () => {
  // docs/science.md §S12 check values [C] for y = [1, 2, 3, 10, 5, 6, 7] at t = 0…6, printed to 6 decimals.
  const t = [0, 1, 2, 3, 4, 5, 6]
  const y = [1, 2, 3, 10, 5, 6, 7]
  it.each([
    [1, [1.558110, 2.473493, 4.472382, 6.394302, 6.444593, 6.214698, 6.517922]],
    [2, [2.945736, 3.699733, 4.534523, 5.296636, 5.851655, 6.178338, 6.351118]],
  ])('σ = %i matches docs/science.md §S12 (reference, and the fast one with truncation at 8σ)', (sigma, expected) => {
    expected.forEach((v, i) => expect(gaussianSmoothReference(t, y, sigma)[i]).toBeCloseTo(v, 6))
    expected.forEach((v, i) => expect(gaussianSmooth(t, y, sigma, 8)[i]).toBeCloseTo(v, 6))
  })

  // R ksmooth(kernel = "normal") puts the kernel quartiles at ±bandwidth/4 (R documentation, quoted
  // in docs/science.md §S2.2), so σ = 0.25·bw/Φ⁻¹(0.75) = 0.3706506·bw.
  it('converts an R ksmooth bandwidth with σ = 0.3706506·bw', () => {
    expect(KSMOOTH_SIGMA_PER_BANDWIDTH).toBeCloseTo(0.3706506, 7)
    expect(KSMOOTH_SIGMA_PER_BANDWIDTH).toBeCloseTo(0.25 / normalQuantile(0.75), 14)
  })

  // Stated agreement (gaussianSmoother.ts): truncation at 4σ drops at most 2(1 − Φ(4)) ≈ 6.3e-5 of
  // the kernel weight, so |fast − exact| ≤ 6.4e-5·(max y − min y).
  it.each([
    ['even spacing', false],
    ['irregular spacing', true],
  ])('fast (±4σ) agrees with the exact reference within 6.4e-5·range(y): %s', (_, irregular) => {
    const rng = createRng(irregular ? 11 : 12)
    const n = 1500
    let time = 0
    const times = Float64Array.from({ length: n }, () => (time += irregular ? 0.2 + 1.6 * rng.uniform() : 1))
    const values = Float64Array.from(times, tt => Math.sin(tt / 200) * 5 + rng.normal())
    const range = Math.max(...values) - Math.min(...values)
    const diff = maxAbsDiff(gaussianSmooth(times, values, 25), gaussianSmoothReference(times, values, 25))
    expect(diff).toBeLessThan(6.4e-5 * range)
  })
})

describe('one-sided local-linear trend', () => {
  const times = Float64Array.from({ length: 3000 }, (_, i) => i)
  // A local-linear fit reproduces straight lines exactly [common practice: local polynomial
  // regression of degree p reproduces polynomials of degree p].
  it('follows a straight ramp with no lag (residual ≈ 0)', () => {
    const ramp = Float64Array.from(times, t => 3 + 0.02 * t)
    const { residuals } = detrend(times, ramp, { kind: 'localLinear', bandwidth: 100 })
    expect(maxAbsDiff(residuals, new Float64Array(times.length))).toBeLessThan(1e-9)
  })
  // Derived here: with weights w = e^{u/h} (u = t_j − t_now ≤ 0) and y = c·t², the line absorbs
  // c·t_now² + 2c·t_now·u exactly and the fitted intercept of the rest, c·u², is
  // c·(S₂² − S₁S₃)/(S₀S₂ − S₁²) with S_k = Σ w·u^k: a constant. In continuous time this is −2ch²,
  // so the residual settles at ≈ 2ch² instead of growing; the test uses the discrete sums.
  it('leaves a constant residual on a constant acceleration, not a growing one', () => {
    const c = 1e-5
    const h = 100
    const quadratic = Float64Array.from(times, t => c * t * t)
    const trend = causalLocalLinearTrend(times, quadratic, h)
    const residualFromSums = (samples: number): number => {
      const s = [0, 0, 0, 0]
      for (let m = 0; m < samples; m++) s.forEach((_, k) => { s[k]! += Math.exp(-m / h) * (-m) ** k })
      const [s0, s1, s2, s3] = s as [number, number, number, number]
      return -c * (s2 * s2 - s1 * s3) / (s0 * s2 - s1 * s1)
    }
    expect(residualFromSums(3000)).toBeCloseTo(2 * c * h * h, 2)
    for (const i of [1500, 2200, 2999]) expect(quadratic[i]! - trend[i]!).toBeCloseTo(residualFromSums(i + 1), 8)
  })

  // By contrast the centred smoother lags at the end of a ramp by the mean of a half-Gaussian,
  // σ·√(2/π) (derived here): the artefact of docs/science.md §S2.2.
  it('unlike the centred Gaussian smoother, whose end-of-record residual on a ramp is slope·σ·√(2/π)', () => {
    const ramp = Float64Array.from(times, t => 0.02 * t)
    const { residuals } = detrend(times, ramp, { kind: 'gaussian', bandwidth: 100 })
    expect(residuals[times.length - 1]).toBeCloseTo(0.02 * 100 * Math.sqrt(2 / Math.PI), 1)
  })
})

describe('linear detrending', () => {
  it('fits the OLS line simple-statistics linearRegression gives', () => {
    const rng = createRng(5)
    const times = Float64Array.from({ length: 400 }, (_, i) => 1000 + 2 * i)
    const values = Float64Array.from(times, t => 4 - 0.01 * t + rng.normal())
    const { m, b } = linearRegression(Array.from(times, (t, i) => [t, values[i]!]))
    const trend = linearTrend(times, values)
    times.forEach((t, i) => expect(trend[i]).toBeCloseTo(m * t + b, 9))
  })
})
