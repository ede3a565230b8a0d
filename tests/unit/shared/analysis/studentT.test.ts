import { describe, expect, it } from 'vitest'
import { studentTCdf, studentTQuantile } from '#shared/analysis/studentT'

// Two-sided critical values of Student's t, as printed in every statistics table [common practice].
describe("Student's t quantiles for the fold-horizon fit", () => {
  it.each([
    [0.975, 1, 12.706], [0.975, 2, 4.303], [0.975, 5, 2.571], [0.99, 4, 3.747], [0.95, 10, 1.812], [0.995, 3, 5.841], [0.975, 30, 2.042],
  ])('t(%f; %i df) = %f', (p, nu, expected) => {
    expect(studentTQuantile(p, nu)).toBeCloseTo(expected, 3)
  })
  it('is symmetric and inverts its CDF', () => {
    expect(studentTQuantile(0.05, 4)).toBeCloseTo(-studentTQuantile(0.95, 4), 12)
    expect(studentTCdf(studentTQuantile(0.9, 7), 7)).toBeCloseTo(0.9, 10)
    // ν = 1 is the Cauchy law: P(T ≤ 1) = 3/4 [common practice].
    expect(studentTCdf(1, 1)).toBeCloseTo(0.75, 12)
  })
  it('refuses fractional degrees of freedom', () => {
    expect(() => studentTQuantile(0.9, 2.5)).toThrow(RangeError)
  })
})
