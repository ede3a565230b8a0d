import { describe, expect, it } from 'vitest'
import { analyseWindow } from '#shared/analysis/windowAnalysis'
import { DEFAULT_QUALITY_LIMITS } from '#shared/analysis/quality'
import { createRng } from '#shared/analysis/random'
import { simulateFold, simulateOu } from '#shared/analysis/simulate'
import type { Indicators } from '#shared/analysis/types'

function indicatorsOf(times: Float64Array, values: Float64Array): Indicators {
  const result = analyseWindow(times, values, { detrend: { kind: 'none' }, quality: DEFAULT_QUALITY_LIMITS })
  if (!result.indicators) throw new Error(`quality gate failed: ${JSON.stringify(result.quality)}`)
  return result.indicators
}

const recovery = (indicators: Indicators): number => {
  if (indicators.recovery.status !== 'ok') throw new Error(`no recovery rate: ${indicators.recovery.status}`)
  return indicators.recovery.rate
}

// OU → AR(1) (docs/science.md §S2.3 / §S12): k = 0.5, σ = 0.3, Δ = 0.1 gives φ = e^{−0.05} = 0.951229 and
// stationary variance σ²/(2k) = 0.09. Tolerances are 4.5 standard errors from sampling theory:
//   SE(φ̂) ≈ √((1 − φ²)/n)                                  (docs/science.md §S2.3)
//   SE(s²) ≈ √(2·Var²·(1 + φ²)/((1 − φ²)·n))               (Bartlett's formula for AR(1) [from memory])
//   relSE(k̂) ≈ √((1 − φ²)/n)/(φ·|ln φ|)                    (docs/science.md §S2.3)
// plus the estimator's bias −(1 + 4φ)/n on φ̂ (docs/science.md §S2.3 table), negligible at this n.
describe('OU process sampled as AR(1) (analytic values, docs/science.md §S2.3)', () => {
  const k = 0.5
  const sigma = 0.3
  const dt = 0.1
  const n = 200_000
  const phi = Math.exp(-k * dt)
  const variance = sigma * sigma / (2 * k)
  it('has φ = 0.951229 and Var = 0.09 analytically', () => {
    expect(phi).toBeCloseTo(0.951229, 6)
    expect(variance).toBeCloseTo(0.09, 12)
  })
  it.each([101, 202, 303])('seed %i: r₁, variance and recovery rate within 4.5 SE of the analytic values', (seed) => {
    const { times, values } = simulateOu({ samples: n, dt, k, sigma }, createRng(seed))
    const result = indicatorsOf(times, values)
    const seAr1 = Math.sqrt((1 - phi * phi) / n)
    const seVariance = Math.sqrt(2 * variance ** 2 * (1 + phi * phi) / ((1 - phi * phi) * n))
    const seRate = k * seAr1 / (phi * Math.abs(Math.log(phi)))
    expect(Math.abs(result.ar1 - (phi - (1 + 4 * phi) / n))).toBeLessThan(4.5 * seAr1)
    expect(Math.abs(result.variance - variance)).toBeLessThan(4.5 * seVariance)
    expect(Math.abs(recovery(result) - k)).toBeLessThan(4.5 * seRate)
  })
})

// Fold normal form ẋ = r + εx − x² (docs/science.md §S1.1): at the stable branch λ = −2√(r − r_c) with
// r_c = −ε²/4, so λ² = 4(r − r_c) is linear in r with slope 4.
describe('fold normal form: the recovery rate follows λ² = 4(r − r_c)', () => {
  const epsilon = 0.2
  const rc = -epsilon * epsilon / 4
  const dt = 0.1
  const n = 100_000
  const estimate = (r: number, seed: number): number => {
    const run = simulateFold({ samples: n, dt, substeps: 20, r: () => r, epsilon, sigma: 0.05, tippedBelow: -5 }, createRng(seed))
    expect(run.tipTime).toBeNull()
    return recovery(indicatorsOf(run.times, run.values))
  }
  // relSE(k̂) ≈ √((1 − φ²)/n)/(φ·|ln φ|) as above; φ = e^{−λΔ}. Euler–Maruyama with step Δ/20 and
  // the quadratic term's curvature add biases of order λ·Δ/20 and σ²/(λ·(r − r_c)) — under 0.5% here.
  it.each([[0.1, 11], [0.3, 12]])('r = %f: k̂ within 4.5 SE (+0.5% model bias) of 2√(r − r_c)', (r, seed) => {
    const lambda = 2 * Math.sqrt(r - rc)
    const phi = Math.exp(-lambda * dt)
    const se = lambda * Math.sqrt((1 - phi * phi) / n) / (phi * lambda * dt)
    expect(Math.abs(estimate(r, seed) - lambda)).toBeLessThan(4.5 * se + 0.005 * lambda)
  })
  it('λ̂² rises with slope ≈ 4 in r', () => {
    const low = estimate(0.1, 21) ** 2
    const high = estimate(0.3, 22) ** 2
    // SE of each λ̂² is 2λ·SE(λ̂); the slope (high − low)/0.2 has SE √(SE₁² + SE₂²)/0.2.
    const seSquared = (r: number): number => {
      const lambda = 2 * Math.sqrt(r - rc)
      const phi = Math.exp(-lambda * dt)
      return 2 * lambda * lambda * Math.sqrt((1 - phi * phi) / n) / (phi * lambda * dt)
    }
    const seSlope = Math.hypot(seSquared(0.1), seSquared(0.3)) / 0.2
    expect(Math.abs((high - low) / 0.2 - 4)).toBeLessThan(4.5 * seSlope + 0.04)
  })
})
