// Exothermic CSTR with a first-order irreversible reaction and a cooling jacket, in the
// dimensionless form of Uppal, Ray & Poore 1974 (Chem Eng Sci 29:967) as set out in docs/science.md §S10.1.
// Time is in residence times θ = V/q; x1 is conversion; x2 = γ(T − T_f)/T_f.
import { allRoots, firstLocalMaximum, numericalJacobian, slowestRate } from '../lib/numerics'

export interface CstrParameters {
  /** Damköhler number k₀·e^(−γ)·θ. */
  Da: number
  /** Dimensionless adiabatic temperature rise. */
  B: number
  /** Dimensionless heat-transfer coefficient UA/(q·ρ·C_p); falls as the jacket fouls. */
  beta: number
  /** Dimensionless coolant temperature γ(T_c − T_f)/T_f. */
  x2c: number
  /** Dimensionless activation energy E/(R·T_f). */
  gamma: number
}

/** The benchmark set of docs/science.md §S10.1 (three steady states at these values). */
export const URP_BENCHMARK: Readonly<CstrParameters> = { Da: 0.072, B: 8, beta: 0.3, x2c: 0, gamma: 20 }

/** Parameters a plant can drift in, each with its own physical story (docs/science.md §S10.1). */
export type CstrDriftParameter = 'Da' | 'beta' | 'x2c'

function arrhenius(x2: number, gamma: number): number {
  return Math.exp(x2 / (1 + x2 / gamma))
}

/** State derivative [x1', x2'] of the model. */
export function cstrDerivative(p: CstrParameters) {
  return ([x1, x2]: readonly number[]): number[] => {
    const rate = p.Da * (1 - x1!) * arrhenius(x2!, p.gamma)
    return [-x1! + rate, -x2! + p.B * rate - p.beta * (x2! - p.x2c)]
  }
}

// On an equilibrium x1' = 0 gives x1 = Da·e/(1 + Da·e), e = Arrhenius(x2): every steady state is
// a root of one scalar equation in x2, which is how multiplicity is found without guessing.
function conversionAtEquilibrium(x2: number, p: CstrParameters): number {
  const e = p.Da * arrhenius(x2, p.gamma)
  return e / (1 + e)
}

function heatBalanceResidual(x2: number, p: CstrParameters): number {
  return -x2 + p.B * conversionAtEquilibrium(x2, p) - p.beta * (x2 - p.x2c)
}

/** All steady states [x1, x2], lowest temperature first. */
export function cstrEquilibria(p: CstrParameters): number[][] {
  return allRoots(x2 => heatBalanceResidual(x2, p), -2, p.B + 2)
    .map(x2 => [conversionAtEquilibrium(x2, p), x2])
}

/** The cool (low-conversion) working point the demo runs on. */
export function cstrLowerEquilibrium(p: CstrParameters): number[] {
  const lower = cstrEquilibria(p)[0]
  if (!lower) throw new RangeError('no steady state found')
  return lower
}

/** Slowest eigenvalue (real part) of the Jacobian at a steady state. */
export function cstrSlowestRate(p: CstrParameters, state: readonly number[]): number {
  return slowestRate(numericalJacobian(cstrDerivative(p), state))
}

// Each parameter solved from the equilibrium conditions as a function of x2. A fold is a turning
// point of that curve: ignition is where the lower branch ends as the parameter moves toward
// runaway.
const parameterAlongBranch: Record<CstrDriftParameter, (x2: number, p: CstrParameters) => number> = {
  Da: (x2, p) => {
    const x1 = ((1 + p.beta) * x2 - p.beta * p.x2c) / p.B
    return x1 / ((1 - x1) * arrhenius(x2, p.gamma))
  },
  // β falls with fouling, so its ignition fold is a minimum: return −β and look for a maximum.
  beta: (x2, p) => -(p.B * conversionAtEquilibrium(x2, p) - x2) / (x2 - p.x2c),
  x2c: (x2, p) => ((1 + p.beta) * x2 - p.B * conversionAtEquilibrium(x2, p)) / p.beta,
}

/** Branch end that a rising Da, rising x2c or falling β runs into: where the cool state ignites. */
export function cstrIgnitionFold(parameter: CstrDriftParameter, base: CstrParameters = URP_BENCHMARK): { value: number; state: number[] } {
  // Lower limit keeps x2 − x2c > 0, where the β expression is defined.
  const along = (x2: number) => parameterAlongBranch[parameter](x2, base)
  const x2 = firstLocalMaximum(along, Math.max(0, base.x2c) + 1e-3, base.B)
  const sign = parameter === 'beta' ? -1 : 1
  const value = sign * along(x2)
  const atFold = { ...base, [parameter]: value }
  return { value, state: [conversionAtEquilibrium(x2, atFold), x2] }
}

/** Extinction fold in Da: where the hot state falls back when Da decreases. */
export function cstrExtinctionDa(base: CstrParameters = URP_BENCHMARK): number {
  const ignitionX2 = cstrIgnitionFold('Da', base).state[1]!
  const minusDa = (x2: number) => -parameterAlongBranch.Da(x2, base)
  return -minusDa(firstLocalMaximum(minusDa, ignitionX2 + 1e-3, base.B))
}

/** Conversion between the dimensionless state and plant units. */
export interface CstrPlantScale {
  /** Feed temperature, K. */
  feedTemperature: number
  /** Feed concentration of the reactant, mol/L. */
  feedConcentration: number
}

/** x2 = γ(T − T_f)/T_f, so T = T_f·(1 + x2/γ). */
export function temperatureFromX2(x2: number, gamma: number, scale: CstrPlantScale): number {
  return scale.feedTemperature * (1 + x2 / gamma)
}

/** Reactant left unconverted: C_A = C_Af·(1 − x1). */
export function concentrationFromX1(x1: number, scale: CstrPlantScale): number {
  return scale.feedConcentration * (1 - x1)
}
