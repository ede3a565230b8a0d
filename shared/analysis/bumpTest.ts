// Bump test: after a deliberate small step, the response relaxes as y(t) = y∞ + (y₀ − y∞)e^{−k(t − t₀)}.
// k is fitted by Levenberg–Marquardt least squares; its standard error comes from the usual
// linearisation cov = s²(JᵀJ)⁻¹ (Seber & Wild 1989, Nonlinear Regression [from memory]).
import { inverse, Matrix, solve } from 'ml-matrix'

export type BumpTestFit =
  | {
    kind: 'fit'
    /** Recovery rate k (1/s) and its standard error. */
    rate: number
    rateSe: number
    initialValue: number
    finalValue: number
    /** SD of the fit residuals (the measurement noise). */
    residualSd: number
    iterations: number
  }
  | { kind: 'no fit', reason: string }

/**
 * Fits the exponential recovery to the samples after the step at `stepTime` (times in seconds).
 * Use the samples from the step onward, covering at least a few recovery times.
 */
export function fitBumpTest(times: ArrayLike<number>, values: ArrayLike<number>, stepTime: number): BumpTestFit {
  const n = values.length
  if (n < 6) return { kind: 'no fit', reason: `${n} samples, need at least 6` }
  const tau = Float64Array.from({ length: n }, (_, i) => times[i]! - stepTime)
  const y = Float64Array.from(values)
  let params = initialGuess(tau, y)
  if (!params) return { kind: 'no fit', reason: 'the response shows no relaxation toward a final value' }
  let damping = 1e-3
  let cost = sumOfSquares(tau, y, params)
  let iterations = 0
  for (; iterations < 200; iterations++) {
    const { jtj, jtr } = normalEquations(tau, y, params)
    const trial = lmStep(jtj, jtr, damping).map((step, i) => params![i]! + step) as Params
    const trialCost = sumOfSquares(tau, y, trial)
    if (trialCost < cost) {
      const converged = (cost - trialCost) <= 1e-12 * cost
      params = trial
      cost = trialCost
      damping = Math.max(damping / 10, 1e-12)
      if (converged) break
    } else {
      damping *= 10
      if (damping > 1e12) break
    }
  }
  const [finalValue, amplitude, rate] = params
  if (!(rate > 0)) return { kind: 'no fit', reason: `fitted rate ${rate} is not a recovery` }
  const s2 = cost / (n - 3)
  const covariance = inverse(new Matrix(normalEquations(tau, y, params).jtj)).mul(s2)
  return {
    kind: 'fit',
    rate,
    rateSe: Math.sqrt(covariance.get(2, 2)),
    initialValue: finalValue + amplitude,
    finalValue,
    residualSd: Math.sqrt(s2),
    iterations,
  }
}

/** z-score of the difference between the bump-test rate and the passive (AR1) estimate. */
export function compareRates(bump: { rate: number, se: number }, passive: { rate: number, se: number }): number {
  return (bump.rate - passive.rate) / Math.hypot(bump.se, passive.se)
}

/** [y∞, y₀ − y∞, k] */
type Params = [number, number, number]

function model(t: number, [finalValue, amplitude, rate]: Params): number {
  return finalValue + amplitude * Math.exp(-rate * t)
}

function sumOfSquares(tau: Float64Array, y: Float64Array, params: Params): number {
  let sum = 0
  for (let i = 0; i < y.length; i++) sum += (y[i]! - model(tau[i]!, params)) ** 2
  return sum
}

function normalEquations(tau: Float64Array, y: Float64Array, params: Params): { jtj: number[][], jtr: number[] } {
  const jtj = [[0, 0, 0], [0, 0, 0], [0, 0, 0]]
  const jtr = [0, 0, 0]
  for (let i = 0; i < y.length; i++) {
    const e = Math.exp(-params[2] * tau[i]!)
    const gradient = [1, e, -params[1] * tau[i]! * e]
    const residual = y[i]! - model(tau[i]!, params)
    for (let a = 0; a < 3; a++) {
      jtr[a]! += gradient[a]! * residual
      for (let b = 0; b < 3; b++) jtj[a]![b]! += gradient[a]! * gradient[b]!
    }
  }
  return { jtj, jtr }
}

/** Marquardt's step: (JᵀJ + λ·diag(JᵀJ))·δ = Jᵀr. */
function lmStep(jtj: number[][], jtr: number[], damping: number): number[] {
  const damped = jtj.map((row, i) => row.map((v, j) => (i === j ? v * (1 + damping) : v)))
  return solve(new Matrix(damped), Matrix.columnVector(jtr)).getColumn(0)
}

/**
 * y∞ from the last fifth of the record; k from the time the distance to y∞ first falls below 1/e
 * of its initial value.
 */
function initialGuess(tau: Float64Array, y: Float64Array): Params | null {
  const n = y.length
  const tail = Math.max(1, Math.floor(n / 5))
  let finalValue = 0
  for (let i = n - tail; i < n; i++) finalValue += y[i]!
  finalValue /= tail
  const amplitude = y[0]! - finalValue
  if (amplitude === 0) return null
  const crossing = y.findIndex(v => Math.abs(v - finalValue) < Math.abs(amplitude) / Math.E)
  const span = tau[n - 1]! - tau[0]!
  const rate = crossing > 0 && tau[crossing]! > 0 ? 1 / tau[crossing]! : 3 / span
  return [finalValue, amplitude, rate]
}
