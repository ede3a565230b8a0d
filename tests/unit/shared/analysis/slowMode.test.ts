import { describe, expect, it } from 'vitest'
import { createRng } from '#shared/analysis/random'
import { slowMode } from '#shared/analysis/slowMode'

/** x_{t+1} = A·x_t + e_t with e ~ N(0, Q) (2 tags), after a burn-in of 2,000 steps. */
function simulateVar2(a: number[][], q: number[][], n: number, seed: number): [Float64Array, Float64Array] {
  const rng = createRng(seed)
  // Cholesky factor of the 2×2 innovation covariance.
  const l11 = Math.sqrt(q[0]![0]!)
  const l21 = q[1]![0]! / l11
  const l22 = Math.sqrt(q[1]![1]! - l21 * l21)
  const x = [new Float64Array(n), new Float64Array(n)] as [Float64Array, Float64Array]
  let x1 = 0
  let x2 = 0
  for (let t = -2000; t < n; t++) {
    const z1 = rng.normal()
    const z2 = rng.normal()
    ;[x1, x2] = [a[0]![0]! * x1 + a[0]![1]! * x2 + l11 * z1, a[1]![0]! * x1 + a[1]![1]! * x2 + l21 * z1 + l22 * z2]
    if (t >= 0) {
      x[0][t] = x1
      x[1][t] = x2
    }
  }
  return x
}

// docs/science.md §S5 check case [C]: J = [[−1, 0.5], [0, −0.1]], Δ = 0.5,
// A = expm(JΔ) = [[0.606531, 0.191499], [0, 0.951229]], eigenvalues e^{−0.5} and e^{−0.05},
// Q_d = [[0.003231, 0.000507], [0.000507, 0.004758]]. The left eigenvector of the slow eigenvalue
// is (0, 1) (from wᵀ(J + 0.1·I) = 0), so the slow mode sits entirely on tag 2.
// Tolerance: each eigenvalue estimate behaves like an AR(1) coefficient, SE ≈ √((1 − μ²)/n)
// (docs/science.md §S2.3; an approximation for the coupled case), and we allow 4.5 SE.
describe('VAR(1) slow mode on the docs/science.md §S5 check case', () => {
  const a = [[0.606531, 0.191499], [0, 0.951229]]
  const q = [[0.003231, 0.000507], [0.000507, 0.004758]]
  const n = 100_000
  const dt = 0.5
  it.each([1, 2, 3])('seed %i: eigenvalues ≈ 0.6065, 0.9512, slow rate ≈ 0.1, slow share on tag 2 > 0.9', (seed) => {
    const mode = slowMode(simulateVar2(a, q, n, seed), dt)
    const moduli = mode.eigenvalues.map(e => Math.hypot(e.re, e.im)).sort()
    const se = (mu: number): number => Math.sqrt((1 - mu * mu) / n)
    expect(Math.abs(moduli[0]! - 0.606531)).toBeLessThan(4.5 * se(0.606531))
    expect(Math.abs(moduli[1]! - 0.951229)).toBeLessThan(4.5 * se(0.951229))
    expect(mode.eigenvalue.modulus).toBe(moduli[1])
    // k = −ln μ/Δ, SE(k) ≈ SE(μ)/(μΔ).
    expect(Math.abs(mode.recoveryRate! - 0.1)).toBeLessThan(4.5 * se(0.951229) / (0.951229 * dt))
    expect(mode.shares[1]).toBeGreaterThan(0.9)
    expect(mode.shares[0]! + mode.shares[1]!).toBeCloseTo(1, 12)
    a.forEach((row, i) => row.forEach((v, j) => expect(Math.abs(mode.transition[i]![j]! - v)).toBeLessThan(0.02)))
  })

  // Two uncoupled tags (A diagonal, Q = 0.01·I), slow one second: its share must dominate, and
  // swapping the tags must move the share with it.
  it('puts the slow mode on the slow tag whichever position it has', () => {
    const [fast, slow] = simulateVar2([[0.5, 0], [0, 0.97]], [[0.01, 0], [0, 0.01]], 50_000, 9)
    expect(slowMode([fast, slow], 1).shares[1]).toBeGreaterThan(0.9)
    expect(slowMode([slow, fast], 1).shares[0]).toBeGreaterThan(0.9)
  })

  // Linear algebra: a per-tag change of units x' = D·x turns A into D·A·D⁻¹, which has the same
  // eigenvalues; shares must not depend on units either (mol/L beside kelvin).
  it('gives the same rate and shares whatever units each tag is in', () => {
    const [x1, x2] = simulateVar2(a, q, 20_000, 4)
    const plain = slowMode([x1, x2], dt)
    const rescaled = slowMode([x1.map(v => v * 1e-3), x2.map(v => v * 250 + 300)], dt)
    expect(rescaled.recoveryRate).toBeCloseTo(plain.recoveryRate!, 10)
    rescaled.shares.forEach((share, i) => expect(share).toBeCloseTo(plain.shares[i]!, 10))
    expect(rescaled.transition[0]![1]).toBeCloseTo(plain.transition[0]![1]! * 1e-3 / 250, 10)
  })
})

