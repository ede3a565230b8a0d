// A growable first-in-first-out queue of fixed-width numeric records in one Float64Array. The
// fields of a record sit side by side, so the live hot loop touches one cache line per sample
// rather than one per field; the capacity is a power of two so positions wrap with a bit mask.

export class RingBuffer {
  private data: Float64Array
  private mask: number
  private head = 0
  private count = 0

  constructor(private readonly width: 1 | 2 | 3, initialCapacity = 64) {
    let capacity = 2
    while (capacity < initialCapacity) capacity *= 2
    this.data = new Float64Array(capacity * width)
    this.mask = capacity - 1
  }

  get length(): number {
    return this.count
  }

  /** Field `field` of the i-th oldest record (0 = oldest). */
  at(i: number, field: number): number {
    return this.data[((this.head + i) & this.mask) * this.width + field]!
  }

  /** Appends a record of up to three fields (fields beyond `width` are ignored); no rest array, as this runs per sample. */
  push(first: number, second = 0, third = 0): void {
    if (this.count === this.mask + 1) this.grow()
    const base = ((this.head + this.count) & this.mask) * this.width
    this.data[base] = first
    if (this.width > 1) this.data[base + 1] = second
    if (this.width > 2) this.data[base + 2] = third
    this.count++
  }

  /** Drops the oldest record. */
  dropOldest(): void {
    if (this.count === 0) throw new RangeError('drop from an empty buffer')
    this.head = (this.head + 1) & this.mask
    this.count--
  }

  /** One field of every record, oldest first, as a new array. */
  field(field: number): Float64Array {
    const out = new Float64Array(this.count)
    for (let i = 0; i < this.count; i++) out[i] = this.at(i, field)
    return out
  }

  private grow(): void {
    const capacity = (this.mask + 1) * 2
    const bigger = new Float64Array(capacity * this.width)
    for (let i = 0; i < this.count; i++) {
      for (let f = 0; f < this.width; f++) bigger[i * this.width + f] = this.at(i, f)
    }
    this.data = bigger
    this.mask = capacity - 1
    this.head = 0
  }
}
