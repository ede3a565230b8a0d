import { describe, expect, it } from 'vitest'
import { poissonUpper95, procedureFalseAlarmRate } from '#shared/analysis/calibration'
import { createRng } from '#shared/analysis/random'
import { simulateOu } from '#shared/analysis/simulate'

describe('whole-procedure false-alarm calibration', () => {
  // One-sided 95% upper limits of a Poisson mean: 0 events → −ln 0.05 = 2.996 ("rule of three"
  // [common practice]); 1 event → 4.744; 10 events → 16.96 (standard tables, [from memory]).
  it.each([[0, 2.996], [1, 4.744], [10, 16.96]])('Poisson upper limit after %i events ≈ %f (±1%)', (count, expected) => {
    expect(Math.abs(poissonUpper95(count) - expected) / expected).toBeLessThan(0.01)
  })

  // A procedure that alarms when a single week-long record's lag-1 sample correlation of white
  // noise exceeds its one-sided 5% point 1.645/√n (SE of r₁ ≈ 1/√n for white noise, docs/science.md §S2.3
  // with φ = 0) must alarm in ≈ 5% of tag-weeks: the count over 400 weeks stays within Poisson-
  // style bounds of the expected 20 (here 20 ± 4.5·√20).
  it('measures the alarm rate of a procedure per tag-week', () => {
    const week = 7 * 24 * 60
    const estimate = procedureFalseAlarmRate(400,
      rng => simulateOu({ samples: week, dt: 60, k: 50, sigma: 1 }, rng),
      ({ values }) => {
        let lag = 0
        let sum2 = 0
        const mean = values.reduce((a, b) => a + b, 0) / values.length
        values.forEach((v, i) => {
          sum2 += (v - mean) ** 2
          if (i > 0) lag += (v - mean) * (values[i - 1]! - mean)
        })
        return lag / sum2 > 1.645 / Math.sqrt(values.length) ? 1 : 0
      }, createRng(55))
    const weeks = estimate.seconds / (7 * 24 * 3600)
    expect(weeks).toBeCloseTo(400 * (week - 1) / week, 9)
    expect(Math.abs(estimate.alarms - 20)).toBeLessThan(4.5 * Math.sqrt(20))
    expect(estimate.perTagWeek).toBeCloseTo(estimate.alarms / weeks, 12)
    expect(estimate.upper95PerTagWeek).toBeGreaterThan(estimate.perTagWeek)
  })
})
