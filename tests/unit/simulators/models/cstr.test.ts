import { describe, expect, it } from 'vitest'
import { eigenvalues2x2, numericalJacobian } from '../../../../simulators/lib/numerics'
import {
  URP_BENCHMARK, cstrDerivative, cstrEquilibria, cstrExtinctionDa, cstrIgnitionFold, cstrSlowestRate,
} from '../../../../simulators/models/cstr'

const at = (change: Partial<typeof URP_BENCHMARK>) => ({ ...URP_BENCHMARK, ...change })

describe('exothermic CSTR, Uppal, Ray & Poore 1974 benchmark (γ = 20, B = 8, β = 0.3, x2c = 0, Da = 0.072)', () => {
  it('has the three published steady states', () => {
    const states = cstrEquilibria(URP_BENCHMARK)
    // docs/science.md §S10.1: Uppal, Ray & Poore 1974 benchmark, steady states (0.1440, 0.8860),
    // (0.4472, 2.7517), (0.7646, 4.7050) [C]
    expect(states).toHaveLength(3)
    const published = [[0.1440, 0.8860], [0.4472, 2.7517], [0.7646, 4.7050]]
    states.forEach((state, i) => {
      expect(state[0]).toBeCloseTo(published[i]![0]!, 4)
      expect(state[1]).toBeCloseTo(published[i]![1]!, 4)
      // Each really is a rest point of the integrated derivative, not just of the reduced equation.
      for (const rate of cstrDerivative(URP_BENCHMARK)(state)) expect(Math.abs(rate)).toBeLessThan(1e-9)
    })
  })

  it('has the published eigenvalues at the cool state, and a saddle in the middle', () => {
    const [cool, middle] = cstrEquilibria(URP_BENCHMARK)
    const { re, im } = eigenvalues2x2(numericalJacobian(cstrDerivative(URP_BENCHMARK), cool!))
    // docs/science.md §S10.1: URP benchmark, cool state eigenvalues −0.8957 and −0.5164 [C]
    expect(im).toBe(0)
    expect(re[0]).toBeCloseTo(-0.8957, 3)
    expect(re[1]).toBeCloseTo(-0.5164, 3)
    // docs/science.md §S10.1: the middle state (0.4472, 2.7517) is a saddle [C]
    const saddle = eigenvalues2x2(numericalJacobian(cstrDerivative(URP_BENCHMARK), middle!))
    expect(saddle.re[0]).toBeLessThan(0)
    expect(saddle.re[1]).toBeGreaterThan(0)
  })

  it.each([
    // docs/science.md §S10.1 [C]: ignition Da* = 0.079886; fouling β* = 0.200917; coolant x2c* = 0.526878
    ['Da', 0.079886],
    ['beta', 0.200917],
    ['x2c', 0.526878],
  ] as const)('ignition fold in %s is at the published %f', (parameter, published) => {
    const fold = cstrIgnitionFold(parameter)
    expect(fold.value).toBeCloseTo(published, 5)
    // At the fold the Jacobian of the integrated model is singular: one eigenvalue is zero.
    const jacobian = numericalJacobian(cstrDerivative(at({ [parameter]: fold.value })), fold.state)
    expect(Math.abs(eigenvalues2x2(jacobian).re[1])).toBeLessThan(1e-5)
  })

  it('extinction fold in Da is at the published 0.066188', () => {
    // docs/science.md §S10.1: extinction at Da = 0.066188 [C]
    expect(cstrExtinctionDa()).toBeCloseTo(0.066188, 5)
  })

  it('the cool state disappears just past the ignition fold', () => {
    const { value } = cstrIgnitionFold('Da')
    expect(cstrEquilibria(at({ Da: value * 0.999 }))).toHaveLength(3)
    expect(cstrEquilibria(at({ Da: value * 1.001 }))).toHaveLength(1)
  })

  it.each([
    // docs/science.md §S10.1: slow eigenvalue on the approach to ignition [C]
    [0.072, -0.516], [0.076, -0.366], [0.078, -0.257], [0.079, -0.177], [0.0795, -0.118], [0.0798, -0.056],
  ])('slow eigenvalue at Da = %f is the published %f', (Da, published) => {
    const p = at({ Da })
    // Within one unit of the last published digit (at 0.0795 this model gives −0.11750).
    expect(Math.abs(cstrSlowestRate(p, cstrEquilibria(p)[0]!) - published)).toBeLessThanOrEqual(1e-3)
  })

  it('λ² is about 34–35·(Da* − Da) near ignition', () => {
    // docs/science.md §S10.1: λ² ≈ 34–35·(Da* − Da), linear as the fold normal form (§S1.1) says [C].
    // The slope is approximate: here it is 34.4 at Da = 0.076 and creeps to 36.1 at 0.0798,
    // so the check allows 34–36.5.
    const daStar = cstrIgnitionFold('Da').value
    for (const Da of [0.076, 0.078, 0.079, 0.0795, 0.0798]) {
      const p = at({ Da })
      const lambda = cstrSlowestRate(p, cstrEquilibria(p)[0]!)
      expect(lambda ** 2 / (daStar - Da)).toBeGreaterThan(34)
      expect(lambda ** 2 / (daStar - Da)).toBeLessThan(36.5)
    }
  })
})
