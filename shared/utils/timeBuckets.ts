// Display downsampling: a chart a thousand pixels wide cannot show more than about a thousand
// points, but min/max per bucket keep every spike visible (computation always uses raw samples).

/** Equal time buckets over [from, to): bucket i covers [from + i·width, from + (i+1)·width). */
export interface BucketGrid { from: number, to: number, count: number }

export function bucketWidth(grid: BucketGrid): number {
  return (grid.to - grid.from) / grid.count
}

/** The bucket a time falls in, or −1 outside the grid. */
export function bucketOf(grid: BucketGrid, time: number): number {
  if (!(time >= grid.from && time < grid.to)) return -1
  return Math.min(grid.count - 1, Math.floor((time - grid.from) / bucketWidth(grid)))
}

export interface Buckets {
  /** Each bucket's end time. */
  time: Float64Array
  /** Mean, smallest and largest value per bucket; NaN for an empty bucket. */
  mean: Float64Array
  min: Float64Array
  max: Float64Array
  /** Index of the bucket's newest sample in the input, −1 for an empty bucket. */
  last: Int32Array
}

/** Summarises time-sorted samples into the grid's buckets; samples outside the grid are skipped. */
export function bucketSamples(times: ArrayLike<number>, values: ArrayLike<number>, grid: BucketGrid): Buckets {
  const { count } = grid
  const width = bucketWidth(grid)
  const sum = new Float64Array(count)
  const n = new Int32Array(count)
  const min = new Float64Array(count).fill(Number.NaN)
  const max = new Float64Array(count).fill(Number.NaN)
  const last = new Int32Array(count).fill(-1)
  for (let i = 0; i < times.length; i++) {
    const b = bucketOf(grid, times[i]!)
    if (b < 0) continue
    const v = values[i]!
    sum[b]! += v
    n[b]!++
    if (!(v >= min[b]!)) min[b] = v
    if (!(v <= max[b]!)) max[b] = v
    last[b] = i
  }
  return {
    time: Float64Array.from({ length: count }, (_, b) => grid.from + (b + 1) * width),
    mean: Float64Array.from(sum, (s, b) => (n[b] ? s / n[b]! : Number.NaN)),
    min,
    max,
    last,
  }
}

/** JSON has no NaN: non-finite numbers travel as null. */
export function toJsonNumbers(values: ArrayLike<number>): (number | null)[] {
  return Array.from(values, v => (Number.isFinite(v) ? v : null))
}

/** Per-minute archive rows (epoch seconds of each minute's start), oldest first. */
export interface ArchivedMinutes {
  minute: Float64Array
  mean: Float64Array
  min: Float64Array
  max: Float64Array
  /** Readings behind each row's figures: the weight of its mean. */
  samples: Int32Array
}

/**
 * Fills buckets no raw sample reached from the archive (raw samples older than the site's raw
 * window live only there): the count-weighted mean, the smallest min and the largest max of the
 * minutes whose middle falls in the bucket. Buckets with raw samples are left as they are.
 * Returns how many readings the filled buckets stand for.
 */
export function fillFromArchive(buckets: Buckets, archive: ArchivedMinutes, grid: BucketGrid): number {
  const sum = new Float64Array(grid.count)
  const n = new Float64Array(grid.count)
  let readings = 0
  for (let i = 0; i < archive.minute.length; i++) {
    const b = bucketOf(grid, archive.minute[i]! + 30)
    if (b < 0 || buckets.last[b]! >= 0 || !(archive.samples[i]! > 0)) continue
    sum[b]! += archive.mean[i]! * archive.samples[i]!
    n[b]! += archive.samples[i]!
    if (!(archive.min[i]! >= buckets.min[b]!)) buckets.min[b] = archive.min[i]!
    if (!(archive.max[i]! <= buckets.max[b]!)) buckets.max[b] = archive.max[i]!
    readings += archive.samples[i]!
  }
  for (let b = 0; b < grid.count; b++) if (n[b]! > 0) buckets.mean[b] = sum[b]! / n[b]!
  return readings
}
