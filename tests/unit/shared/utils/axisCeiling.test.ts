import { describe, expect, it } from 'vitest'
import { axisCeiling, CEILING_OVER_UPPER_QUARTILE } from '../../../../shared/utils/axisCeiling'

// Upper quartile by the nearest-rank rule on the sorted absolute values [common practice].
describe('axisCeiling', () => {
  const rise = Array.from({ length: 100 }, (_, i) => 1 + 4 * i / 99) // a steady 1 → 5 rise

  it('leaves a steady rise of up to five times unclipped', () => {
    expect(axisCeiling(rise)).toBeNull()
  })

  it('clips a post-trip spike and counts the points above', () => {
    const withSpike = [...rise, 200, 300, null, 150]
    const c = axisCeiling(withSpike)!
    const sorted = withSpike.filter((v): v is number => v !== null).sort((a, b) => a - b)
    expect(c.value).toBe(CEILING_OVER_UPPER_QUARTILE * sorted[Math.floor(0.75 * (sorted.length - 1))]!)
    expect(c.above).toBe(3)
    expect(c.value).toBeLessThan(150)
  })

  it('treats negative residual spikes by size', () => {
    expect(axisCeiling([...rise, -400])?.above).toBe(1)
  })

  it('does not judge a handful of points', () => {
    expect(axisCeiling([1, 2, 1000])).toBeNull()
  })
})
