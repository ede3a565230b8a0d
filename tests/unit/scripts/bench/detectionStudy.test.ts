// Pure helpers of the early-warning detection benchmark (scripts/bench/detectionStudy/).
import { describe, expect, it } from 'vitest'
import { trendTau } from '#shared/analysis/kendall'
import { createRng } from '#shared/analysis/random'
import { forEachCountWindow } from '#shared/analysis/windowTracks'
import { BENCH_MODELS, eigenvalue } from '../../../../scripts/bench/detectionStudy/models'
import { argMax, bisect } from '../../../../scripts/bench/detectionStudy/numerics'
import { rollingAr1AndVariance } from '../../../../scripts/bench/detectionStudy/rollingIndicators'
import { median, quantile, rocAuc, wilson } from '../../../../scripts/bench/detectionStudy/stats'
import { trendTauFast } from '../../../../scripts/bench/detectionStudy/trendTau'

describe('Wilson score interval', () => {
  // Newcombe 1998 (Stat Med 17:857–872), Table II, method 3 (score, no continuity correction)
  // [values from memory]: 81/263 → 0.2553–0.3662, 15/148 → 0.0624–0.1605, 0/20 → 0–0.1611,
  // 1/29 → 0.0061–0.1718.
  it.each([
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ])('%i/%i → [%f, %f]', (hits, trials, low, high) => {
    const r = wilson(hits, trials)
    expect(r.low).toBeCloseTo(low, 4)
    expect(r.high).toBeCloseTo(high, 4)
  })

  it('says nothing without trials', () => {
    expect(wilson(0, 0)).toMatchObject({ low: 0, high: 1 })
  })
})

describe('ROC AUC', () => {
  // By hand: forced {0.9, 0.8, 0.4} vs null {0.7, 0.4, 0.1}. 0.9 and 0.8 beat all three nulls
  // (3 + 3); 0.4 loses to 0.7, ties 0.4 (½) and beats 0.1 (1). AUC = 7.5/9.
  it('counts ties as one half', () => {
    expect(rocAuc([0.9, 0.8, 0.4], [0.7, 0.4, 0.1]).auc).toBeCloseTo(7.5 / 9, 12)
  })

  it('is ½ when every record gets the same score, 1 and 0 at perfect separation', () => {
    expect(rocAuc([0, 0, 0], [0, 0]).auc).toBe(0.5)
    expect(rocAuc([2, 3], [0, 1]).auc).toBe(1)
    expect(rocAuc([0, 1], [2, 3]).auc).toBe(0)
  })

  // Hanley & McNeil 1982 (Radiology 143:29–36): Q1 = A/(2 − A), Q2 = 2A²/(1 + A) [from memory].
  // At A = ½ with m = n = 1 the variance is A(1 − A) = ¼.
  it('has the Hanley–McNeil standard error', () => {
    expect(rocAuc([1], [1]).se).toBeCloseTo(0.5, 12)
  })
})

describe('order statistics', () => {
  it('takes medians and type-7 quantiles, with infinite order statistics kept finite where they can be', () => {
    expect(median([3, 1, 2])).toBe(2)
    expect(median([4, 1, 2, 3])).toBe(2.5)
    expect(quantile([1, 2, 3, 4, 5], 0.25)).toBe(2)
    expect(quantile([0, 10], 0.05)).toBeCloseTo(0.5, 12)
    expect(quantile([1, 2, Number.POSITIVE_INFINITY], 0.5)).toBe(2)
    expect(quantile([1, 2, Number.POSITIVE_INFINITY], 0.75)).toBe(Number.POSITIVE_INFINITY)
  })
})

describe('fast paths agree with the shared analysis code', () => {
  const rng = createRng(2024)

  it('trendTauFast equals kendall trendTau, ties included', () => {
    for (const n of [2, 3, 17, 250, 601]) {
      const coarse = Array.from({ length: n }, () => Math.round(3 * rng.normal()))
      const fine = Array.from({ length: n }, () => rng.normal())
      expect(trendTauFast(coarse)).toBeCloseTo(trendTau(coarse), 12)
      expect(trendTauFast(fine)).toBeCloseTo(trendTau(fine), 12)
    }
    expect(trendTauFast([1, 1, 1])).toBeNaN()
  })

  it('rollingAr1AndVariance equals forEachCountWindow on every window', () => {
    const n = 400
    const times = Float64Array.from({ length: n }, (_, i) => i)
    let x = 0
    const values = Float64Array.from({ length: n }, (_, i) => (x = 0.8 * x + rng.normal()) + 50 + 0.01 * i)
    const fast = rollingAr1AndVariance(values, 120)
    let k = 0
    forEachCountWindow(times, values, 120, 1, (indicators) => {
      expect(fast.ar1[k]).toBeCloseTo(indicators.ar1, 10)
      expect(fast.variance[k]! / indicators.variance).toBeCloseTo(1, 10)
      k++
    })
    expect(k).toBe(fast.ar1.length)
  })
})

describe('numerics and the models built on them', () => {
  it('finds roots and peaks', () => {
    expect(bisect(x => x * x - 2, 0, 2)).toBeCloseTo(Math.SQRT2, 10)
    expect(argMax(x => -((x - 0.3) ** 2), 0, 1)).toBeCloseTo(0.3, 8)
  })

  // At a fold or a transcritical point the monitored equilibrium's rate λ = ∂f/∂x reaches 0; just
  // short of it λ < 0. This checks the computed critical values without recalling them.
  it.each(BENCH_MODELS.map(m => [m.name, m] as const))('%s: λ → 0⁻ at the computed critical value', (_name, model) => {
    const nearly = model.p0 + (1 - 1e-6) * (model.critical - model.p0)
    expect(eigenvalue(model, model.p0)).toBeLessThan(0)
    expect(eigenvalue(model, nearly)).toBeLessThan(0)
    expect(Math.abs(eigenvalue(model, nearly))).toBeLessThan(1e-2)
  })
})
