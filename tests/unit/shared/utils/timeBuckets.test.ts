import { describe, expect, it } from 'vitest'
import { bucketOf, bucketSamples, fillFromArchive, toJsonNumbers } from '#shared/utils/timeBuckets'

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

describe('fillFromArchive', () => {
  // Minutes of 0–60 s, 60–120 s, 120–180 s; buckets of 120 s. Combining per-minute summaries:
  // the pooled mean is the count-weighted mean of the group means [common practice].
  const grid = { from: 0, to: 240, count: 2 }
  const archive = {
    minute: Float64Array.from([0, 60, 120]),
    mean: Float64Array.from([10, 20, 50]),
    min: Float64Array.from([9, 15, 40]),
    max: Float64Array.from([11, 30, 60]),
    samples: Int32Array.from([1, 3, 4]),
  }

  it('fills empty buckets with the weighted mean, the smallest min and the largest max', () => {
    const b = bucketSamples([], [], grid)
    expect(fillFromArchive(b, archive, grid)).toBe(8)
    expect(b.mean[0]).toBeCloseTo((10 * 1 + 20 * 3) / 4, 12)
    expect([b.min[0], b.max[0]]).toEqual([9, 30])
    expect([b.mean[1], b.min[1], b.max[1]]).toEqual([50, 40, 60])
  })

  it('leaves a bucket that has raw samples as the raw samples make it', () => {
    const b = bucketSamples([130, 150], [1, 3], grid)
    expect(fillFromArchive(b, archive, grid)).toBe(4)
    expect([b.mean[1], b.min[1], b.max[1]]).toEqual([2, 1, 3])
    expect(b.mean[0]).toBeCloseTo(17.5, 12)
  })
})
