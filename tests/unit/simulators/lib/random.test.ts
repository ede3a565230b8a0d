import { describe, expect, it } from 'vitest'
import { boxMuller, deriveSeed, seededNormal, seededUniform } from '../../../../simulators/lib/random'

describe('seeded randomness', () => {
  it('replays exactly from the same seed and differs between seeds', () => {
    const a = seededUniform(42)
    const b = seededUniform(42)
    const c = seededUniform(43)
    const fromA = Array.from({ length: 5 }, a)
    expect(Array.from({ length: 5 }, b)).toEqual(fromA)
    expect(Array.from({ length: 5 }, c)).not.toEqual(fromA)
    expect(deriveSeed(1, 'cstr:process')).not.toBe(deriveSeed(1, 'cstr:sensors'))
  })

  it('uniforms lie in [0, 1) with mean 1/2 and variance 1/12', () => {
    const uniform = seededUniform(1)
    const xs = Array.from({ length: 200_000 }, uniform)
    expect(xs.reduce((a, b) => Math.min(a, b))).toBeGreaterThanOrEqual(0)
    expect(xs.reduce((a, b) => Math.max(a, b))).toBeLessThan(1)
    const mean = xs.reduce((a, b) => a + b, 0) / xs.length
    // Standard facts of U(0,1) [common practice]; SE of the mean ≈ 0.00065.
    expect(mean).toBeCloseTo(0.5, 2)
    expect(xs.reduce((a, x) => a + (x - mean) ** 2, 0) / xs.length).toBeCloseTo(1 / 12, 3)
  })

  it('Box–Muller normals have mean 0, variance 1 and the normal tail mass', () => {
    const normal = boxMuller(seededUniform(9))
    const xs = Array.from({ length: 200_000 }, normal)
    const mean = xs.reduce((a, b) => a + b, 0) / xs.length
    const varc = xs.reduce((a, x) => a + (x - mean) ** 2, 0) / xs.length
    expect(Math.abs(mean)).toBeLessThan(0.01)
    expect(Math.abs(varc - 1)).toBeLessThan(0.015)
    // P(|Z| > 1.96) = 0.05 for a standard normal [common practice]; SE ≈ 0.0005.
    expect(xs.filter(x => Math.abs(x) > 1.96).length / xs.length).toBeCloseTo(0.05, 2)
    expect(seededNormal(3)()).toBe(seededNormal(3)())
  })
})
