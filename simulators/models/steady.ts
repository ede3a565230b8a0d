// A well-controlled variable: an Ornstein–Uhlenbeck process dX = −k(X − setpoint)dt + σ dW around
// its setpoint. Its recovery rate k never changes, so an early-warning monitor must stay quiet on
// it: it is the demo's control unit. docs/science.md §S2.3 gives its stationary law.

export interface SteadyLoopParameters {
  setpoint: number
  /** Recovery rate of the closed loop, s⁻¹. */
  k: number
  /** Noise intensity, engineering units per √s. */
  sigma: number
}

/** State derivative of one controlled variable. */
export function steadyLoopDerivative(p: SteadyLoopParameters) {
  return ([x]: readonly number[]): number[] => [-p.k * (x! - p.setpoint)]
}

/** Stationary variance σ²/(2k) (docs/science.md §S2.3). */
export function steadyLoopVariance(p: SteadyLoopParameters): number {
  return p.sigma ** 2 / (2 * p.k)
}

/** Noise intensity that gives a wanted stationary standard deviation: σ = sd·√(2k). */
export function sigmaForStandardDeviation(sd: number, k: number): number {
  return sd * Math.sqrt(2 * k)
}
