import { describe, expect, it } from 'vitest'
import { createRng } from '#shared/analysis/random'
import { simulateOu } from '#shared/analysis/simulate'
import { fillOnBucketGrid, buildUnitSlowMode } from '#shared/utils/unitSlowMode'

describe('fillOnBucketGrid', () => {
  it('averages per grid step and carries the last value across empty steps', () => {
    const tag = { tagId: 1, samplePeriodS: 1, times: Float64Array.of(0, 0.5, 3.2), values: Float64Array.of(1, 3, 9) }
    const [series] = fillOnBucketGrid([tag], { from: 0, to: 4, count: 4 })
    expect(Array.from(series!)).toEqual([2, 2, 2, 9])
  })
})

describe('buildUnitSlowMode', () => {
  // Two independent OU tags: the slower one (k = 0.02/s) must carry the slow mode and set the
  // unit's slowest recovery rate (docs/science.md §S5: the leading eigenvalue of a diagonal A is the
  // slower tag's e^{−kΔ}).
  const slow = simulateOu({ samples: 3_600, dt: 2, k: 0.02, sigma: 1 }, createRng(3))
  const fast = simulateOu({ samples: 3_600, dt: 2, k: 0.3, sigma: 1 }, createRng(4))
  const tags = [
    { tagId: 10, samplePeriodS: 2, ...slow },
    { tagId: 11, samplePeriodS: 2, ...fast },
    { tagId: 12, samplePeriodS: 2, times: new Float64Array(), values: new Float64Array() },
  ]
  const view = buildUnitSlowMode(tags, { from: 0, to: 7_200 })

  it('gives the slow tag most of the share and a rate near its own', () => {
    expect(view.tagIds).toEqual([10, 11])
    expect(view.skipped).toEqual([{ tagId: 12, reason: 'no samples in the range' }])
    expect(view.shares[0]).toBeGreaterThan(0.8)
    expect(view.shares[0]! + view.shares[1]!).toBeCloseTo(1, 12)
    expect(view.recoveryRate).toBeGreaterThan(0.01)
    expect(view.recoveryRate).toBeLessThan(0.04)
  })

  it('has a recovery-rate history over the range', () => {
    expect(view.history.time.length).toBeGreaterThan(50)
    expect(view.history.time.length).toBe(view.history.recoveryRate.length)
    expect(view.history.time.at(-1)).toBe(7_200)
  })

  it('says why when the range is too short', () => {
    const short = buildUnitSlowMode(tags, { from: 7_100, to: 7_200 })
    expect(short.reason).toMatch(/grid points/)
    expect(short.shares).toEqual([])
  })
})
