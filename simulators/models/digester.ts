// Anaerobic digester: the methanogenic step of AM2 (Bernard et al. 2001, Biotechnol Bioeng
// 75:424) with acidogenesis in quasi-steady state — the 2-state reduction of docs/science.md §S10.3.
// State [X2, S2]: methanogen biomass (g/L) and volatile fatty acids (mmol/L); time in days.
import { goldenMaximum, numericalJacobian, slowestRate } from '../lib/numerics'

/** AM2 constants used by the reduction (docs/science.md §S10.3). */
export const AM2 = {
  mu2max: 0.74, // d⁻¹
  KS2: 9.28, // mmol/L
  KI2: 256, // mmol/L
  alpha: 0.5, // fraction of biomass leaving with the liquid
  k3: 268, // mmol VFA consumed per g methanogens grown
  k6: 453, // mmol CH₄ produced per g methanogens grown
} as const

export interface DigesterParameters {
  /** Dilution rate q/V, d⁻¹ (the inverse of the hydraulic retention time). */
  D: number
  /** VFA the acidogens hand on, mmol/L (S2 in the feed plus what acidogenesis makes). */
  S2eff: number
}

/** Haldane kinetics: growth rises with VFA, then falls as VFA inhibits the methanogens. */
export function methanogenGrowthRate(S2: number): number {
  return AM2.mu2max * S2 / (S2 + AM2.KS2 + S2 * S2 / AM2.KI2)
}

/** State derivative [X2', S2']. */
export function digesterDerivative(p: DigesterParameters) {
  return ([X2, S2]: readonly number[]): number[] => {
    const mu2 = methanogenGrowthRate(S2!)
    return [(mu2 - AM2.alpha * p.D) * X2!, p.D * (p.S2eff - S2!) - AM2.k3 * mu2 * X2!]
  }
}

/**
 * Working (stable) steady state: the smaller root of μ2(S2) = αD, and X2 from the VFA balance.
 * Undefined past the fold, where μ2 can no longer keep up with dilution.
 */
export function digesterWorkingPoint(p: DigesterParameters): number[] {
  const [S2] = vfaWhereGrowthMatchesDilution(p.D)
  return [(p.S2eff - S2) / (AM2.k3 * AM2.alpha), S2]
}

/**
 * Both VFA levels where methanogens grow exactly as fast as they are washed out: the working
 * node (lower) and the saddle (upper) that bounds its basin. They meet at the fold.
 */
export function vfaWhereGrowthMatchesDilution(D: number): [number, number] {
  const growth = AM2.alpha * D
  // μ2max·S2 = growth·(S2 + KS2 + S2²/KI2)  ⇒  (growth/KI2)·S2² + (growth − μ2max)·S2 + growth·KS2 = 0
  const a = growth / AM2.KI2
  const b = growth - AM2.mu2max
  const c = growth * AM2.KS2
  const disc = b * b - 4 * a * c
  if (disc < 0) throw new RangeError(`no working point at D = ${D} d⁻¹: past the fold`)
  return [(-b - Math.sqrt(disc)) / (2 * a), (-b + Math.sqrt(disc)) / (2 * a)]
}

/** Slowest eigenvalue (real part) of the Jacobian at a state, d⁻¹. */
export function digesterSlowestRate(p: DigesterParameters, state: readonly number[]): number {
  return slowestRate(numericalJacobian(digesterDerivative(p), state))
}

/**
 * Fold in the dilution rate, found from the kinetics: the working point exists only while αD is
 * below the peak of the Haldane curve, so D_c = max μ2 / α, reached at S2 = √(KS2·KI2).
 */
export function digesterFoldDilution(): { D: number; S2: number } {
  const S2 = goldenMaximum(methanogenGrowthRate, 1, 500, 1e-9)
  return { D: methanogenGrowthRate(S2) / AM2.alpha, S2 }
}

/** The same fold in closed form: αD_c = μ2max / (1 + 2√(KS2/KI2)). */
export function digesterFoldDilutionClosedForm(): number {
  return AM2.mu2max / (AM2.alpha * (1 + 2 * Math.sqrt(AM2.KS2 / AM2.KI2)))
}

/** Methane production k6·μ2·X2, mmol CH₄ per litre of reactor per day (AM2). */
export function methaneProductionRate([X2, S2]: readonly number[]): number {
  return AM2.k6 * methanogenGrowthRate(S2!) * X2!
}
