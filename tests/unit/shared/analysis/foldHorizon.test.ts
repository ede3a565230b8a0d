import { describe, expect, it } from 'vitest'
import { foldHorizon, recoveryRateSe } from '#shared/analysis/foldHorizon'
import type { FoldHorizon } from '#shared/analysis/foldHorizon'
import { rollingIndicators } from '#shared/analysis/windowAnalysis'
import { createRng } from '#shared/analysis/random'
import { simulateFold, simulateOu } from '#shared/analysis/simulate'
import type { SampledSeries } from '#shared/analysis/simulate'
import type { DetrendSpec } from '#shared/analysis/types'
import { binomialBounds } from './support/binomial'

const dt = 0.1
const windowSamples = 1000

/** Recovery rates of 100-unit windows every 10 time units, then the fold horizon seen at t = 800. */
function horizonOf(run: SampledSeries, detrend: DetrendSpec): FoldHorizon {
  const series = rollingIndicators(run.times, run.values, { window: { kind: 'count', samples: windowSamples }, detrend, step: 100 })
  const points = []
  for (let i = 0; i < series.time.length; i++) {
    const rate = series.recoveryRate[i]!
    // A window's estimate describes its middle.
    if (Number.isFinite(rate)) points.push({
      time: series.time[i]! - windowSamples * dt / 2, rate, se: recoveryRateSe(rate, dt, windowSamples)
    })
  }
  return foldHorizon(points, { windowSeconds: windowSamples * dt, alpha: 0.01, confidence: 0.9, now: 800 })
}

// Fold normal form ẋ = r(t) − x² + σξ with r(t) = 1 − t/1000 (docs/science.md §S1.1): λ² = 4r falls
// linearly in time and reaches zero at the fold, t* = 1000. Observed up to t = 800 (r = 0.2).
describe('fold horizon on a slow ramp toward the fold (docs/science.md §S1.1)', () => {
  const runs = Array.from({ length: 20 }, (_, seed) => simulateFold({
    samples: 8000, dt, substeps: 10, r: t => 1 - t / 1000, epsilon: 0, sigma: 0.05, tippedBelow: -3,
  }, createRng(1000 + seed)))
  const horizons = runs.map(run => horizonOf(run, { kind: 'gaussian', bandwidth: 30 }))
  const inView = horizons.filter(h => h.kind === 'fold in view')

  // The slope test uses Student's t on the ~8 independent windows (6 df), no longer the normal
  // quantile, so it is stricter than before (13 of these 20 runs, was 16); more than half must see it.
  it('sees the fold in most runs, with slope d(λ²)/dt of the analytic −4/1000', () => {
    expect(inView.length).toBeGreaterThanOrEqual(11)
    // Mean slope over runs vs −0.004: each slope SE is reported; the mean's SE is √Σse²/m.
    const meanSlope = inView.reduce((s, h) => s + h.slope, 0) / inView.length
    const se = Math.sqrt(inView.reduce((s, h) => s + h.slopeSe ** 2, 0)) / inView.length
    expect(Math.abs(meanSlope + 0.004)).toBeLessThan(4.5 * se)
  })

  // Observed at t = 800 the fold is 200 time units ahead: a projection of "already reached"
  // (the former "0 min") would be wrong whatever its band says.
  it('never projects a fold that has already been reached', () => {
    for (const h of inView) expect(h.kind === 'fold in view' && h.horizon).toBeGreaterThan(0)
  })

  // The 90% band is a confidence interval: the number of bands containing t* = 1000 among the
  // runs that report one is Binomial(m, 0.9); we require at least its 0.1% lower bound.
  it('brackets the true fold time t* = 1000 at the band\'s nominal rate', () => {
    const bracketing = inView.filter(h => h.low <= 1000 && h.high >= 1000).length
    expect(bracketing).toBeGreaterThanOrEqual(binomialBounds(inView.length, 0.9)[0])
  })
})

// On a stationary OU process (k = 1 throughout) the falling-slope test at α = 0.01 must rarely
// fire: the count over 40 records is at most Binomial(40, 0.01)'s 0.1% upper bound.
describe('no fold in view without a loss of stability', () => {
  it('reports "no fold in view" on stationary records at about the test\'s level', () => {
    const horizons = Array.from({ length: 40 }, (_, seed) =>
      horizonOf(simulateOu({ samples: 8000, dt, k: 1, sigma: 0.05 }, createRng(2000 + seed)), { kind: 'localLinear', bandwidth: 30 }))
    const falseFolds = horizons.filter(h => h.kind === 'fold in view').length
    expect(falseFolds).toBeLessThanOrEqual(binomialBounds(40, 0.01)[1])
    const quiet = horizons.find(h => h.kind === 'no fold in view')
    expect(quiet).toMatchObject({ kind: 'no fold in view', reason: expect.stringContaining('not falling') })
  })
  it('needs enough points', () => {
    expect(foldHorizon([{ time: 0, rate: 1, se: 0.1 }], { windowSeconds: 1, alpha: 0.01, confidence: 0.9, now: 0 }).kind).toBe('no fold in view')
  })
})
