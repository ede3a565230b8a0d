import { describe, expect, it } from 'vitest'
import { bucketOf, bucketSamples, toJsonNumbers } from '#shared/utils/timeBuckets'

describe('bucketSamples', () => {
  const grid = { from: 0, to: 10, count: 5 }

  it('keeps mean, min, max and the newest index of each bucket', () => {
    const b = bucketSamples([0, 1, 2.5, 3, 9.9], [4, -2, 7, 1, 5], grid)
    expect(Array.from(b.time)).toEqual([2, 4, 6, 8, 10])
    expect(Array.from(b.mean)).toEqual([1, 4, Number.NaN, Number.NaN, 5])
    expect(Array.from(b.min)).toEqual([-2, 1, Number.NaN, Number.NaN, 5])
    expect(Array.from(b.max)).toEqual([4, 7, Number.NaN, Number.NaN, 5])
    expect(Array.from(b.last)).toEqual([1, 3, -1, -1, 4])
  })

  it('skips samples outside [from, to)', () => {
    const b = bucketSamples([-1, 10, 11], [1, 2, 3], grid)
    expect(Array.from(b.last)).toEqual([-1, -1, -1, -1, -1])
    expect(bucketOf(grid, 10)).toBe(-1)
    expect(bucketOf(grid, 9.999)).toBe(4)
  })

  it('sends non-finite numbers as null', () => {
    expect(toJsonNumbers([1, Number.NaN, Number.POSITIVE_INFINITY])).toEqual([1, null, null])
  })
})
