// Two-bus power system: a stiff source E∠0 behind reactance X feeding a load P + jQ, Q = P·tanφ,
// with 1-state load restoration (simplest case of Karlsson & Hill 1994, IEEE Trans Power Syst
// 9(1):157). All quantities per unit; time in seconds. docs/science.md §S10.2.
import { bisect, goldenMaximum } from '../lib/numerics'

export interface TwoBusParameters {
  /** Source voltage, pu. */
  E: number
  /** Line reactance, pu. */
  X: number
  /** Load reactive-to-active power ratio Q/P. */
  tanPhi: number
  /** Load restoration time constant, s. */
  Tp: number
}

/** E = 1, X = 0.5 pu, unity power factor, T_p = 60 s: the set docs/science.md §S10.2 tabulates. */
export const TWO_BUS_REFERENCE: Readonly<TwoBusParameters> = { E: 1, X: 0.5, tanPhi: 0, Tp: 60 }

/** Load-bus voltage when the load draws admittance G (with susceptance G·tanφ). */
export function loadBusVoltage(G: number, p: TwoBusParameters): number {
  const xg = p.X * G
  return p.E / Math.sqrt((1 + xg * p.tanPhi) ** 2 + xg * xg)
}

/** Active power the load actually receives at admittance G: G·V(G)². */
export function deliveredPower(G: number, p: TwoBusParameters): number {
  return G * loadBusVoltage(G, p) ** 2
}

/**
 * Load restoration: the load raises its admittance until it draws the demanded power P0.
 * State [G, η], where η is a relative load fluctuation (OU, correlation time `tau` seconds) that
 * multiplies the demand: ambient switching of many small loads.
 */
export function twoBusDerivative(p: TwoBusParameters, demand: number, tau: number) {
  return ([G, eta]: readonly number[]): number[] =>
    [(demand * (1 + eta!) - deliveredPower(G!, p)) / p.Tp, -eta! / tau]
}

/** Nose of the P–V curve in closed form: P_max = E²cosφ/(2X(1+sinφ)), V_crit = E/√(2(1+sinφ)). */
export function pvNoseClosedForm(p: TwoBusParameters): { Pmax: number; Vcrit: number } {
  const phi = Math.atan(p.tanPhi)
  return {
    Pmax: p.E ** 2 * Math.cos(phi) / (2 * p.X * (1 + Math.sin(phi))),
    Vcrit: p.E / Math.sqrt(2 * (1 + Math.sin(phi))),
  }
}

/** Nose found from the network equations: the largest power the line can deliver, and where. */
export function pvNose(p: TwoBusParameters): { Pmax: number; Vcrit: number; G: number } {
  // Beyond G = 10/X the delivered power is far past its peak for any practical tanφ.
  const G = goldenMaximum(g => deliveredPower(g, p), 0, 10 / p.X, 1e-12)
  return { Pmax: deliveredPower(G, p), Vcrit: loadBusVoltage(G, p), G }
}

/** Stable operating admittance for demand P0: the root of G·V(G)² = P0 below the nose. */
export function stableAdmittance(demand: number, p: TwoBusParameters): number {
  const nose = pvNose(p)
  if (demand > nose.Pmax) throw new RangeError(`demand ${demand} pu exceeds the nose at ${nose.Pmax} pu`)
  return bisect(g => deliveredPower(g, p) - demand, 0, nose.G, 1e-14)
}

/** High-voltage solution of V⁴ + (2QX − E²)V² + X²(P² + Q²) = 0 (the upper half of the P–V curve). */
export function pvUpperVoltage(P: number, p: TwoBusParameters): number {
  const Q = P * p.tanPhi
  const root = Math.sqrt(p.E ** 4 - 4 * Q * p.X * p.E ** 2 - 4 * p.X ** 2 * P ** 2)
  return Math.sqrt((p.E ** 2 - 2 * Q * p.X + root) / 2)
}

/** Eigenvalue of the load-restoration state at its stable equilibrium: −P′(G*)/T_p, s⁻¹. */
export function loadRestorationRate(demand: number, p: TwoBusParameters): number {
  const G = stableAdmittance(demand, p)
  const h = 1e-7 * Math.max(G, 1e-3)
  const slope = (deliveredPower(G + h, p) - deliveredPower(G - h, p)) / (2 * h)
  return -slope / p.Tp
}
