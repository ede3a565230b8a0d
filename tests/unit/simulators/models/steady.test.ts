import { describe, expect, it } from 'vitest'
import { integrate } from '../../../../simulators/lib/eulerMaruyama'
import { seededNormal } from '../../../../simulators/lib/random'
import { steadyLoopDerivative, steadyLoopVariance } from '../../../../simulators/models/steady'
import { FEED_TANK_LEVEL, FEED_TANK_TEMPERATURE, createSteadyUnit } from '../../../../simulators/units/steadyUnit'

function lagOneAutocorrelation(xs: readonly number[]): number {
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length
  let num = 0
  let den = 0
  xs.forEach((x, i) => {
    den += (x - mean) ** 2
    if (i > 0) num += (x - mean) * (xs[i - 1]! - mean)
  })
  return num / den
}

function variance(xs: readonly number[]): number {
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length
  return xs.reduce((a, x) => a + (x - mean) ** 2, 0) / (xs.length - 1)
}

describe('steady loop: Ornstein–Uhlenbeck process integrated by Euler–Maruyama', () => {
  it('has the published stationary variance and lag-1 autocorrelation (k = 0.5, σ = 0.3, Δ = 0.1)', () => {
    const loop = { setpoint: 0, k: 0.5, sigma: 0.3 }
    const normal = seededNormal(2024)
    const samples: number[] = []
    let state = [0]
    for (let i = 0; i < 100_000; i++) {
      state = integrate(state, steadyLoopDerivative(loop), [loop.sigma], 0.1, 0.01, normal)
      samples.push(state[0]!)
    }
    // docs/science.md §S2.3: stationary variance σ²/(2k) = 0.09 [C; R: goffda::r_ou documentation]
    expect(steadyLoopVariance(loop)).toBeCloseTo(0.09, 12)
    // Sampling error of the variance here is ~2% (1 SE); allow 4 SE.
    expect(Math.abs(variance(samples) / 0.09 - 1)).toBeLessThan(0.08)
    // docs/science.md §S2.3: lag-1 autocorrelation φ = e^(−kΔ) = 0.951229 [C]; SE ≈ √((1 − φ²)/n) = 0.001.
    expect(lagOneAutocorrelation(samples)).toBeCloseTo(0.951229, 2)
  })

  it('T-400 stays near its setpoints for a simulated day, with no drift in its noise', () => {
    const unit = createSteadyUnit({ speed: 1, normal: seededNormal(7) })
    const temperature: number[] = []
    const level: number[] = []
    for (let t = 0; t < 86_400; t += 5) {
      unit.advance(5)
      const values = unit.trueValues()
      temperature.push(values['TI-401']!)
      level.push(values['LI-402']!)
    }
    const sdT = Math.sqrt(steadyLoopVariance(FEED_TANK_TEMPERATURE))
    const sdL = Math.sqrt(steadyLoopVariance(FEED_TANK_LEVEL))
    for (const x of temperature) expect(Math.abs(x - FEED_TANK_TEMPERATURE.setpoint)).toBeLessThan(6 * sdT)
    for (const x of level) expect(Math.abs(x - FEED_TANK_LEVEL.setpoint)).toBeLessThan(6 * sdL)
    // The control must look the same at the end of the day as at the start: the indicators an
    // early-warning monitor reads (variance, lag-1 autocorrelation) do not trend.
    const third = Math.floor(temperature.length / 3)
    const first = temperature.slice(0, third)
    const last = temperature.slice(-third)
    expect(variance(last) / variance(first)).toBeGreaterThan(0.75)
    expect(variance(last) / variance(first)).toBeLessThan(1.33)
    expect(Math.abs(lagOneAutocorrelation(last) - lagOneAutocorrelation(first))).toBeLessThan(0.05)
  })
})
