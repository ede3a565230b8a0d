// A growable first-in-first-out queue of numbers over one Float64Array.

export class RingBuffer {
  private data: Float64Array
  private head = 0
  private count = 0

  constructor(initialCapacity = 64) {
    this.data = new Float64Array(Math.max(2, initialCapacity))
  }

  get length(): number {
    return this.count
  }

  /** The i-th oldest element (0 = oldest). */
  at(i: number): number {
    return this.data[(this.head + i) % this.data.length]!
  }

  push(value: number): void {
    if (this.count === this.data.length) this.grow()
    this.data[(this.head + this.count) % this.data.length] = value
    this.count++
  }

  /** Removes and returns the oldest element. */
  shift(): number {
    if (this.count === 0) throw new RangeError('shift from an empty buffer')
    const value = this.data[this.head]!
    this.head = (this.head + 1) % this.data.length
    this.count--
    return value
  }

  /** Copies the contents, oldest first, into a new array. */
  toArray(): Float64Array {
    const out = new Float64Array(this.count)
    for (let i = 0; i < this.count; i++) out[i] = this.at(i)
    return out
  }

  private grow(): void {
    const bigger = new Float64Array(this.data.length * 2)
    for (let i = 0; i < this.count; i++) bigger[i] = this.at(i)
    this.data = bigger
    this.head = 0
  }
}
