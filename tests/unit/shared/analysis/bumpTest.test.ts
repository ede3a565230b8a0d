import { describe, expect, it } from 'vitest'
import { compareRates, fitBumpTest } from '#shared/analysis/bumpTest'
import { createRng } from '#shared/analysis/random'
import { binomialBounds } from './support/binomial'

/** y(t) = y∞ + (y₀ − y∞)e^{−kt} sampled every second for 300 s, plus white noise of SD 0.05. */
function noisyRecovery(seed: number, k: number) {
  const rng = createRng(seed)
  const times = Float64Array.from({ length: 300 }, (_, i) => 1000 + i)
  const values = Float64Array.from(times, t => 20 + (22 - 20) * Math.exp(-k * (t - 1000)) + 0.05 * rng.normal())
  return { times, values }
}

// Asymptotic theory of nonlinear least squares (Seber & Wild 1989 [from memory]): k̂ is
// approximately normal with the SE from s²(JᵀJ)⁻¹. So over seeded replicates, |k̂ − k| ≤ 1.96·SE
// holds in ~95% of fits (count within Binomial(200, 0.95) bounds at 0.1% per side), and a single
// fit lies within 4.5 SE.
describe('bump-test exponential recovery fit', () => {
  it('recovers k = 0.03 /s within 4.5 reported SE, with y₀ ≈ 22 and y∞ ≈ 20', () => {
    const { times, values } = noisyRecovery(1, 0.03)
    const fit = fitBumpTest(times, values, 1000)
    if (fit.kind !== 'fit') throw new Error(fit.reason)
    expect(Math.abs(fit.rate - 0.03)).toBeLessThan(4.5 * fit.rateSe)
    expect(fit.finalValue).toBeCloseTo(20, 1)
    expect(fit.initialValue).toBeCloseTo(22, 1)
    expect(fit.residualSd).toBeCloseTo(0.05, 2)
  })

  it('reports a standard error whose 95% intervals cover the true k at the nominal rate', () => {
    const replicates = 200
    let covered = 0
    for (let seed = 0; seed < replicates; seed++) {
      const { times, values } = noisyRecovery(100 + seed, 0.03)
      const fit = fitBumpTest(times, values, 1000)
      if (fit.kind === 'fit' && Math.abs(fit.rate - 0.03) <= 1.96 * fit.rateSe) covered++
    }
    const [low, high] = binomialBounds(replicates, 0.95)
    expect(covered).toBeGreaterThanOrEqual(low)
    expect(covered).toBeLessThanOrEqual(high)
  })

  it('refuses a response that never moves', () => {
    const times = Float64Array.from({ length: 50 }, (_, i) => i)
    expect(fitBumpTest(times, new Float64Array(50).fill(3), 0).kind).toBe('no fit')
  })

  it('compares with a passive estimate as a z-score', () => {
    expect(compareRates({ rate: 0.05, se: 0.003 }, { rate: 0.04, se: 0.004 })).toBeCloseTo(2, 12)
  })
})
