import type { Normal } from './random'

/** Right-hand side of an ODE system: the deterministic drift f(x). */
export type Derivative = (state: readonly number[]) => number[]

/**
 * One Euler–Maruyama step of dx = f(x) dt + σ dW with additive, independent noise per state:
 * x + f(x)·dt + σ·√dt·ξ, ξ ~ N(0, 1). Additive noise stands in for the small feed and load
 * fluctuations that keep a real plant jittering around its operating point.
 */
export function eulerMaruyamaStep(
  state: readonly number[], derivative: Derivative, noiseSd: readonly number[], dt: number, normal: Normal,
): number[] {
  const rate = derivative(state)
  const sqrtDt = Math.sqrt(dt)
  return state.map((x, i) => x + rate[i]! * dt + (noiseSd[i] ?? 0) * sqrtDt * normal())
}

/** Advance by `duration` in steps no longer than `maxStep` (explicit schemes need small steps). */
export function integrate(
  state: readonly number[], derivative: Derivative, noiseSd: readonly number[],
  duration: number, maxStep: number, normal: Normal,
): number[] {
  const steps = Math.max(1, Math.ceil(duration / maxStep))
  const dt = duration / steps
  let current = [...state]
  for (let i = 0; i < steps; i++) current = eulerMaruyamaStep(current, derivative, noiseSd, dt, normal)
  return current
}
