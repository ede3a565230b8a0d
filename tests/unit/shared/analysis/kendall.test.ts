import { describe, expect, it } from 'vitest'
import { kendallTau, kendallTauNaive } from '#shared/analysis/kendall'
import { createRng } from '#shared/analysis/random'

describe('Kendall τ worked examples', () => {
  // Hollander & Wolfe (1973) p. 187f tuna data, base R cor.test example (docs/science.md §S12):
  // R prints T = 26; exact=FALSE gives one-sided p = 0.04765 (no continuity correction, z = 1.668115).
  it('tuna data: τ = 0.4444444, S = 16, Var(S) = 92, z = 1.668115, p(greater) = 0.04765', () => {
    const x = [44.4, 45.9, 41.9, 53.3, 44.7, 44.1, 50.7, 45.2, 60.1]
    const y = [2.6, 3.1, 2.5, 5.0, 3.6, 4.0, 5.2, 2.8, 3.8]
    const result = kendallTau(x, y)
    expect(result.tauB).toBeCloseTo(0.4444444, 7)
    expect(result.s).toBe(16)
    expect(result.varianceS).toBeCloseTo(92, 10)
    expect(result.z).toBeCloseTo(1.668115, 6)
    expect(result.pGreater).toBeCloseTo(0.04765, 5)
  })
  // Kendall (1976) Rank Correlation Methods Ex. 3.4 and Ex. 4.3, via the R package `Kendall`
  // documentation (docs/science.md §S12): documented S = 34 for both, τ = 0.41 for Ex. 3.4 and
  // Var(S) = 203.30 for Ex. 4.3; the τ-b, τ-a and Var(S) digits are computed values [C] (docs/science.md §S12).
  it.each([
    {
      name: 'Ex. 3.4 (heavy ties)', s: 34, tauB: 0.4075438063, tauA: 0.25, varianceS: 344.5588,
      x: [2.5, 2.5, 2.5, 2.5, 5, 6.5, 6.5, 10, 10, 10, 10, 10, 14, 14, 14, 16, 17],
      y: [1, 1, 1, 1, 2, 1, 1, 2, 1, 1, 1, 1, 1, 1, 2, 2, 2],
    },
    {
      name: 'Ex. 4.3', s: 34, tauB: 0.5528638004, tauA: 0.5151515, varianceS: 203.3030303,
      x: [1.5, 1.5, 3, 4, 6, 6, 6, 8, 9.5, 9.5, 11, 12],
      y: [2.5, 2.5, 7, 4.5, 1, 4.5, 6, 11.5, 11.5, 8.5, 8.5, 10],
    },
  ])('Kendall $name: S = $s, τ-b = $tauB, τ-a = $tauA, Var(S) = $varianceS', (example) => {
    const result = kendallTau(example.x, example.y)
    expect(result.s).toBe(example.s)
    expect(result.tauB).toBeCloseTo(example.tauB, 10)
    expect(result.tauA).toBeCloseTo(example.tauA, 7)
    expect(result.varianceS).toBeCloseTo(example.varianceS, 4)
  })
})

describe('Knight O(n log n) τ equals the O(n²) pair count', () => {
  const rng = createRng(7)
  const cases = Array.from({ length: 60 }, (_, k) => {
    const n = 2 + rng.integer(300)
    const levels = [2, 5, 20, 1e9][k % 4]!
    return [n, levels, Array.from({ length: n }, () => rng.integer(levels)), Array.from({ length: n }, () => rng.integer(levels))] as const
  })
  it.each(cases)('n = %i, values on %i levels (ties)', (_, __, x, y) => {
    const fast = kendallTau(x, y)
    const slow = kendallTauNaive(x, y)
    expect(fast.s).toBe(slow.s)
    expect(fast.varianceS).toBeCloseTo(slow.varianceS, 6)
    if (Number.isNaN(slow.tauB)) expect(fast.tauB).toBeNaN()
    else expect(fast.tauB).toBeCloseTo(slow.tauB, 12)
  })
})
