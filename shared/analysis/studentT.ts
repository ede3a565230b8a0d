// Student's t distribution for small, whole degrees of freedom: the fold-horizon fit has only a
// handful of independent recovery-rate windows, where the normal quantile claims far too much.

/**
 * P(|T| < t) for T ~ t(ν), ν a positive integer: the finite trigonometric sums of Abramowitz &
 * Stegun 26.7.3 (ν odd) and 26.7.4 (ν even) [from memory], with θ = atan(t/√ν).
 */
function centralProbability(t: number, nu: number): number {
  const theta = Math.atan(Math.abs(t) / Math.sqrt(nu))
  const c2 = Math.cos(theta) ** 2
  const s = Math.sin(theta)
  if (nu % 2 === 0) {
    let term = 1
    let sum = 1
    for (let k = 2; k <= nu - 2; k += 2) {
      term *= c2 * (k - 1) / k
      sum += term
    }
    return s * sum
  }
  if (nu === 1) return 2 * theta / Math.PI
  let term = Math.cos(theta)
  let sum = term
  for (let k = 3; k <= nu - 2; k += 2) {
    term *= c2 * (k - 1) / k
    sum += term
  }
  return (2 / Math.PI) * (theta + s * sum)
}

/** P(T ≤ t) for T ~ t(ν), ν a positive integer. */
export function studentTCdf(t: number, nu: number): number {
  const half = centralProbability(t, nu) / 2
  return t >= 0 ? 0.5 + half : 0.5 - half
}

/** The p-quantile of t(ν), ν a positive integer, by bisection on the CDF (to ~1e-12 relative). */
export function studentTQuantile(p: number, nu: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`probability must lie in (0, 1), got ${p}`)
  if (!(Number.isInteger(nu) && nu >= 1)) throw new RangeError(`degrees of freedom must be a positive integer, got ${nu}`)
  if (p < 0.5) return -studentTQuantile(1 - p, nu)
  let low = 0
  let high = 1
  while (studentTCdf(high, nu) < p) high *= 2
  for (let i = 0; i < 200 && high - low > 1e-12 * high; i++) {
    const mid = (low + high) / 2
    if (studentTCdf(mid, nu) < p) low = mid
    else high = mid
  }
  return (low + high) / 2
}
