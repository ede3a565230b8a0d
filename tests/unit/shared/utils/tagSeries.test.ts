import { describe, expect, it } from 'vitest'
import { rollingIndicators } from '#shared/analysis/windowAnalysis'
import { createRng } from '#shared/analysis/random'
import { simulateOu } from '#shared/analysis/simulate'
import { defaultIndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import { chartIndicatorSettings } from '#shared/utils/chartIndicatorSettings'
import { buildTagSeries } from '#shared/utils/tagSeries'

const settings = chartIndicatorSettings(1)
const SAMPLES = 6_000
const grid = { from: 1_000, to: SAMPLES, count: 250 }

// k² falling linearly to zero at t_c is the fold's signature (docs/design.md §D1, docs/science.md §S1.1).
const FOLD_TIME = 7_000
const approachingFold = simulateOu({ samples: SAMPLES, dt: 1, k: t => 0.5 * Math.sqrt(1 - t / FOLD_TIME), sigma: 0.2 }, createRng(7))
const steady = simulateOu({ samples: SAMPLES, dt: 1, k: 0.5, sigma: 0.2 }, createRng(8))

describe('buildTagSeries', () => {
  const view = buildTagSeries({ ...approachingFold, grid, settings, seed: 1 })

  it('returns one aligned array per chart', () => {
    const n = view.time.length
    for (const key of ['value', 'valueMin', 'valueMax', 'trend', 'residual', 'variance', 'ar1', 'recoveryRate', 'recoveryProjection'] as const)
      expect(view[key], key).toHaveLength(n)
    expect(view.sampleCount).toBe(SAMPLES - grid.from)
  })

  it('computes indicators on the raw samples, the same numbers as the engine', () => {
    const full = rollingIndicators(approachingFold.times, approachingFold.values, { window: settings.window, detrend: settings.detrend })
    const b = 100
    const bucketEnd = view.time[b]!
    // The step is floor(5000 / 250) = 20 samples; the bucket's last evaluation is at or before its end.
    const k = full.time.findLastIndex(t => t < bucketEnd && (t - full.time[0]!) % 20 === 0)
    expect(view.ar1[b]).toBeCloseTo(full.ar1[k]!, 12)
    expect(view.variance[b]).toBeCloseTo(full.variance[k]!, 12)
  })

  it('projects the fold near where k² reaches zero, inside its band', () => {
    expect(view.fold.kind).toBe('projected')
    if (view.fold.kind !== 'projected') return
    expect(view.fold.low!).toBeLessThan(FOLD_TIME)
    expect(view.fold.high!).toBeGreaterThan(FOLD_TIME)
    expect(view.recoveryProjection.filter(v => v !== null).length).toBeGreaterThan(1)
    expect(view.time.length).toBeGreaterThan(grid.count)
  })

  it('tests the trend over the tag\'s trend window: a rising AR1 is significant, a steady one is not', () => {
    // Over the last 3,000 s the AR(1) coefficient e^{−k} rises from about 0.69 to 0.83.
    const long = chartIndicatorSettings(1, { ...defaultIndicatorSettings(1), trendWindowSamples: 3_000 })
    expect(buildTagSeries({ ...approachingFold, grid, settings: long, seed: 1 }).significance!.ar1.p!).toBeLessThanOrEqual(0.05)
    const calm = buildTagSeries({ ...steady, grid, settings: long, seed: 1 })
    expect(calm.fold.kind).toBe('none')
    expect(calm.significance!.ar1.p!).toBeGreaterThan(0.05)
    expect(calm.time).toHaveLength(grid.count)
  })
})
