// The live path: indicators of a sliding window updated in O(1) per sample.
import { indicatorsFromSums } from './indicators'
import { centredFromShifted, shiftedSums } from './moments'
import { RingBuffer } from './ringBuffer'
import type { CentredSums, Indicators, WindowSpec } from './types'

const TIME = 0
const RESIDUAL = 1
const LEVEL = 2

/**
 * A sliding window of (time, residual, raw level) samples that keeps running power sums, so
 * adding a sample and dropping the oldest costs O(1) whatever the window length.
 *
 * Numerics: the sums are of d = residual − shift, where the shift is the window mean at the last
 * re-anchoring. Raw power sums about zero would cancel catastrophically on NIST NumAcc-style data
 * (offset 1e7, spread 0.1); about a shift within half an SD of the mean, converting to central
 * moments loses at most a small constant factor of precision (see `centredFromShifted`). The sums
 * are recomputed from the stored samples about the current mean whenever the mean drifts further
 * than that (at most 8 times per window length), and in any case every 16 window lengths, which also bounds the rounding error that
 * adding and removing accumulates (it grows only like √updates). Amortised cost stays O(1).
 */
export class RollingWindow {
  // One record per sample: [time, residual, raw level].
  private readonly samples = new RingBuffer(3)
  private shift = 0
  private levelShift = 0
  private s1 = 0
  private s2 = 0
  private s3 = 0
  private s4 = 0
  private lag = 0
  private levelSum = 0
  private updatesSinceAnchor = 0
  /** residual − shift of the newest sample (saves a read per push). */
  private newestDeviation = 0

  constructor(private readonly window: WindowSpec) {
    const size = window.kind === 'count' ? window.samples : window.seconds
    if (!(size > 0)) throw new RangeError(`window must be positive, got ${size}`)
  }

  get size(): number {
    return this.samples.length
  }

  /** Adds a sample (times must not decrease) and drops those that fell out of the window. */
  push(time: number, residual: number, level = residual): void {
    if (this.size === 0) this.anchorAt(residual, level)
    else if (time < this.samples.at(this.size - 1, TIME)) throw new RangeError(`time went backwards at ${time}`)
    const d = residual - this.shift
    if (this.size > 0) this.lag += d * this.newestDeviation
    this.addPowers(d, 1)
    this.levelSum += level - this.levelShift
    this.samples.push(time, residual, level)
    this.newestDeviation = d
    while (this.overfull()) this.dropOldest()
    const since = ++this.updatesSinceAnchor
    // Re-anchoring on drift is rationed to 8 per window length so a raw ramp cannot make it O(n) per sample.
    if (since >= 16 * Math.max(this.size, 16) || (8 * since >= this.size && this.meanDriftedFromShift())) this.reanchor()
  }

  /** Centred sums of the residuals in the window (what a two-pass computation would give). */
  sums(): CentredSums {
    const n = this.size
    if (n === 0) throw new RangeError('window is empty')
    return centredFromShifted({
      n, shift: this.shift, s1: this.s1, s2: this.s2, s3: this.s3, s4: this.s4, lag: this.lag,
      first: this.samples.at(0, RESIDUAL) - this.shift,
      last: this.samples.at(n - 1, RESIDUAL) - this.shift,
    })
  }

  /** Indicators of the current window; Δt is the mean spacing (t_last − t_first)/(n − 1). */
  indicators(): Indicators {
    const n = this.size
    const span = n > 1 ? this.samples.at(n - 1, TIME) - this.samples.at(0, TIME) : 0
    return indicatorsFromSums(this.sums(), {
      dt: n > 1 ? span / (n - 1) : 0,
      levelMean: this.levelShift + this.levelSum / n,
    })
  }

  /** Time of the newest sample. */
  latestTime(): number {
    return this.samples.at(this.size - 1, TIME)
  }

  /** The window's residuals, oldest first (a copy). */
  residualValues(): Float64Array {
    return this.samples.field(RESIDUAL)
  }

  /** True once the window mean sits more than half an SD from the shift (cancellation would grow). */
  private meanDriftedFromShift(): boolean {
    const n = this.size
    const a = this.s1 / n
    return 4 * a * a * n > this.s2 - a * this.s1
  }

  private overfull(): boolean {
    if (this.window.kind === 'count') return this.size > this.window.samples
    return this.latestTime() - this.samples.at(0, TIME) > this.window.seconds
  }

  private dropOldest(): void {
    const d0 = this.samples.at(0, RESIDUAL) - this.shift
    const level0 = this.samples.at(0, LEVEL)
    this.samples.dropOldest()
    if (this.size > 0) this.lag -= d0 * (this.samples.at(0, RESIDUAL) - this.shift)
    this.addPowers(d0, -1)
    this.levelSum -= level0 - this.levelShift
  }

  private addPowers(d: number, sign: 1 | -1): void {
    const d2 = d * d
    this.s1 += sign * d
    this.s2 += sign * d2
    this.s3 += sign * d2 * d
    this.s4 += sign * d2 * d2
  }

  private anchorAt(shift: number, levelShift: number): void {
    this.shift = shift
    this.levelShift = levelShift
    this.s1 = this.s2 = this.s3 = this.s4 = this.lag = this.levelSum = 0
  }

  private reanchor(): void {
    const n = this.size
    const residuals = this.samples.field(RESIDUAL)
    const fresh = shiftedSums(residuals, this.shift + this.s1 / n)
    this.shift = fresh.shift
    this.s1 = fresh.s1
    this.s2 = fresh.s2
    this.s3 = fresh.s3
    this.s4 = fresh.s4
    this.lag = fresh.lag
    this.newestDeviation = fresh.last
    const levelMean = this.levelShift + this.levelSum / n
    this.levelSum = 0
    for (let i = 0; i < n; i++) this.levelSum += this.samples.at(i, LEVEL) - levelMean
    this.levelShift = levelMean
    this.updatesSinceAnchor = 0
  }
}
