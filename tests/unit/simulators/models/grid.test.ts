import { describe, expect, it } from 'vitest'
import {
  TWO_BUS_REFERENCE, loadBusVoltage, loadRestorationRate, pvNose, pvNoseClosedForm, pvUpperVoltage,
  stableAdmittance,
} from '../../../../simulators/models/grid'

const withTan = (tanPhi: number) => ({ ...TWO_BUS_REFERENCE, tanPhi })

describe('two-bus power system, nose of the P–V curve (Dobson & Chiang 1989; Van Cutsem & Vournas 1998)', () => {
  it.each([
    // docs/science.md §S10.2, E = 1, X = 0.5 pu [D, checked C]: unity pf P_max = 1.0, V_crit = 0.7071;
    // tanφ = 0.2 P_max = 0.819804, V_crit = 0.646544; "pf 0.9" P_max = 0.626971, V_crit = 0.590147.
    // The pf 0.9 row is reproduced with tanφ = 0.484 (pf 0.9001); exactly pf 0.9 (tanφ = 0.4843)
    // gives 0.626789 / 0.590098 — the published row rounded tanφ.
    // Last column: decimals the published V_crit is given to.
    [0, 1.0, 0.7071, 4],
    [0.2, 0.819804, 0.646544, 6],
    [0.484, 0.626971, 0.590147, 6],
  ])('tanφ = %f: nose found from the network equations at P_max = %f, V_crit = %f', (tanPhi, Pmax, Vcrit, digits) => {
    const nose = pvNose(withTan(tanPhi))
    expect(nose.Pmax).toBeCloseTo(Pmax, 6)
    // The numerical maximum is flat in G, so the voltage there is good to ~1e-8 only.
    expect(nose.Vcrit).toBeCloseTo(Vcrit, Math.min(digits, 5))
    const closed = pvNoseClosedForm(withTan(tanPhi))
    expect(closed.Pmax).toBeCloseTo(Pmax, 6)
    expect(closed.Vcrit).toBeCloseTo(Vcrit, digits)
  })

  it.each([
    // docs/science.md §S10.2: unity-pf P–V check values [D, checked C]
    [0.5, 0.96593], [0.8, 0.89443], [0.9, 0.84732], [0.95, 0.81002], [0.99, 0.75534], [1.0, 0.70711],
  ])('unity pf: V = %f pu at P = %f', (P, V) => {
    expect(pvUpperVoltage(P, TWO_BUS_REFERENCE)).toBeCloseTo(V, 5)
    // The dynamic model settles on the same voltage (not defined exactly at the nose).
    if (P < 1) expect(loadBusVoltage(stableAdmittance(P, TWO_BUS_REFERENCE), TWO_BUS_REFERENCE)).toBeCloseTo(V, 5)
  })

  it.each([
    // docs/science.md §S10.2: load-restoration eigenvalue with T_p = 60 s, Karlsson & Hill 1994 exponential-recovery load [D]
    [0.5, -0.01347], [0.8, -0.00800], [0.9, -0.00522], [0.95, -0.00341], [0.99, -0.00134], [0.999, -0.00039],
  ])('load restoration eigenvalue at P0 = %f pu is the published %f s⁻¹', (P0, published) => {
    const lambda = loadRestorationRate(P0, TWO_BUS_REFERENCE)
    expect(lambda).toBeCloseTo(published, 5)
    // docs/science.md §S10.2: closed form λ = −(E²/T_p)·p²√(1 − p²)/(2(1 − √(1 − p²))) [D]
    const root = Math.sqrt(1 - P0 ** 2)
    expect(lambda).toBeCloseTo(-(1 / 60) * P0 ** 2 * root / (2 * (1 - root)), 8)
  })

  it('λ² ≈ (E⁴/(2T_p²))·(1 − p) near the nose', () => {
    // docs/science.md §S10.2: near the nose λ² ≈ (E⁴/(2T_p²))·(1 − p) [D]
    const ratio = loadRestorationRate(0.9999, TWO_BUS_REFERENCE) ** 2 / ((1 / (2 * 60 ** 2)) * 1e-4)
    expect(ratio).toBeGreaterThan(0.97)
    expect(ratio).toBeLessThan(1.03)
  })
})
