import { describe, expect, it } from 'vitest'
import {
  digesterDerivative, digesterFoldDilution, digesterFoldDilutionClosedForm, digesterSlowestRate,
  digesterWorkingPoint, vfaWhereGrowthMatchesDilution,
} from '../../../../simulators/models/digester'

const S2eff = 100

describe('anaerobic digester, AM2 2-state reduction (Bernard et al. 2001)', () => {
  it('washout fold from the kinetics is at the published D_c', () => {
    const fold = digesterFoldDilution()
    // docs/science.md §S10.3: Bernard et al. 2001 AM2, D_c = 1.07185 d⁻¹ at S2 = √(KS2·KI2) = 48.74 mmol/L [C]
    expect(fold.D).toBeCloseTo(1.07185, 5)
    expect(fold.S2).toBeCloseTo(48.74, 2)
    expect(digesterFoldDilutionClosedForm()).toBeCloseTo(1.07185, 5)
    // docs/science.md §S10.3: HRT_c = 0.933 d [C]
    expect(1 / fold.D).toBeCloseTo(0.933, 3)
  })

  it('no working point exists past the fold', () => {
    expect(() => digesterWorkingPoint({ D: 1.0722, S2eff })).toThrow(RangeError)
  })

  it.each([
    // docs/science.md §S10.3: slow eigenvalue with S2eff = 100 mmol/L [C]
    [0.8, -0.338], [1.0, -0.223], [1.05, -0.101], [1.06, -0.067], [1.07, -0.021], [1.071, -0.013],
  ])('slow eigenvalue at D = %f d⁻¹ is the published %f d⁻¹', (D, published) => {
    const p = { D, S2eff }
    const state = digesterWorkingPoint(p)
    for (const rate of digesterDerivative(p)(state)) expect(Math.abs(rate)).toBeLessThan(1e-9)
    expect(digesterSlowestRate(p, state)).toBeCloseTo(published, 3)
  })

  it('working point moves from the published 11.5 to 45.2 mmol/L', () => {
    // docs/science.md §S10.3: working point S2* = 11.5 → 45.2 mmol/L over D = 0.8 → 1.071 [C]
    expect(digesterWorkingPoint({ D: 0.8, S2eff })[1]).toBeCloseTo(11.5, 1)
    expect(digesterWorkingPoint({ D: 1.071, S2eff })[1]).toBeCloseTo(45.2, 1)
  })

  it('the saddle bounding the working basin is at the published 98.85 mmol/L at D = 1.0', () => {
    // docs/science.md §S10.3: saddle S2 = 98.85 at D = 1.0, so bistability with washout begins near D ≈ 0.998 [C]
    expect(vfaWhereGrowthMatchesDilution(1.0)[1]).toBeCloseTo(98.85, 2)
    // The saddle enters the physical range (S2 < S2eff) between D = 0.99 and 1.0.
    expect(vfaWhereGrowthMatchesDilution(0.99)[1]).toBeGreaterThan(S2eff)
  })
})
