// The live path: indicators of a sliding window updated in O(1) per sample.
import { indicatorsFromSums } from './indicators'
import { centredFromShifted, shiftedSums } from './moments'
import { RingBuffer } from './ringBuffer'
import type { CentredSums, Indicators, WindowSpec } from './types'

/**
 * A sliding window of (time, residual, raw level) samples that keeps running power sums, so
 * adding a sample and dropping the oldest costs O(1) whatever the window length.
 *
 * Numerics: the sums are of d = residual − shift, where the shift is the window mean at the last
 * re-anchoring. Raw power sums about zero would cancel catastrophically on NIST NumAcc-style data
 * (offset 1e7, spread 0.1); about a shift near the mean, Σd² ≈ Σ(x − mean)² and the conversion to
 * central moments loses almost nothing. Every `window length` updates the sums are recomputed from
 * the stored samples about the current mean, which bounds both the drift of the mean away from
 * the shift and the rounding error accumulated by adding and removing. That costs O(1) amortised.
 */
export class RollingWindow {
  private readonly times = new RingBuffer()
  private readonly residuals = new RingBuffer()
  private readonly levels = new RingBuffer()
  private shift = 0
  private levelShift = 0
  private s1 = 0
  private s2 = 0
  private s3 = 0
  private s4 = 0
  private lag = 0
  private levelSum = 0
  private updatesSinceAnchor = 0

  constructor(private readonly window: WindowSpec) {
    const size = window.kind === 'count' ? window.samples : window.seconds
    if (!(size > 0)) throw new RangeError(`window must be positive, got ${size}`)
  }

  get size(): number {
    return this.residuals.length
  }

  /** Adds a sample (times must not decrease) and drops those that fell out of the window. */
  push(time: number, residual: number, level = residual): void {
    if (this.size === 0) this.anchorAt(residual, level)
    else if (time < this.times.at(this.size - 1)) throw new RangeError(`time went backwards at ${time}`)
    const d = residual - this.shift
    if (this.size > 0) this.lag += d * (this.residuals.at(this.size - 1) - this.shift)
    this.addPowers(d, 1)
    this.levelSum += level - this.levelShift
    this.times.push(time)
    this.residuals.push(residual)
    this.levels.push(level)
    while (this.overfull()) this.dropOldest()
    if (++this.updatesSinceAnchor >= Math.max(this.size, 16)) this.reanchor()
  }

  /** Centred sums of the residuals in the window (what a two-pass computation would give). */
  sums(): CentredSums {
    const n = this.size
    if (n === 0) throw new RangeError('window is empty')
    return centredFromShifted({
      n, shift: this.shift, s1: this.s1, s2: this.s2, s3: this.s3, s4: this.s4, lag: this.lag,
      first: this.residuals.at(0) - this.shift,
      last: this.residuals.at(n - 1) - this.shift,
    })
  }

  /** Indicators of the current window; Δt is the mean spacing (t_last − t_first)/(n − 1). */
  indicators(): Indicators {
    const n = this.size
    const span = n > 1 ? this.times.at(n - 1) - this.times.at(0) : 0
    return indicatorsFromSums(this.sums(), {
      dt: n > 1 ? span / (n - 1) : 0,
      levelMean: this.levelShift + this.levelSum / n,
    })
  }

  /** Time of the newest sample. */
  latestTime(): number {
    return this.times.at(this.size - 1)
  }

  /** The window's residuals, oldest first (a copy). */
  residualValues(): Float64Array {
    return this.residuals.toArray()
  }

  private overfull(): boolean {
    if (this.window.kind === 'count') return this.size > this.window.samples
    return this.latestTime() - this.times.at(0) > this.window.seconds
  }

  private dropOldest(): void {
    const d0 = this.residuals.shift() - this.shift
    if (this.size > 0) this.lag -= d0 * (this.residuals.at(0) - this.shift)
    this.addPowers(d0, -1)
    this.levelSum -= this.levels.shift() - this.levelShift
    this.times.shift()
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
    const residuals = this.residuals.toArray()
    const fresh = shiftedSums(residuals, this.shift + this.s1 / n)
    this.shift = fresh.shift
    this.s1 = fresh.s1
    this.s2 = fresh.s2
    this.s3 = fresh.s3
    this.s4 = fresh.s4
    this.lag = fresh.lag
    const levelMean = this.levelShift + this.levelSum / n
    this.levelSum = 0
    for (let i = 0; i < n; i++) this.levelSum += this.levels.at(i) - levelMean
    this.levelShift = levelMean
    this.updatesSinceAnchor = 0
  }
}
