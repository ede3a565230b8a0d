// One-sided local-linear trend: at each new sample, a straight line fitted by least squares to
// all past samples with weights exp(−age/bandwidth). A centred smoother lags behind a mean that
// accelerates near the end of the record and leaves a growing residual that mimics slowing down
// (docs/science.md §S2.2); a local line follows a steady ramp with no lag. Because it uses only
// the past, a residual never changes once computed, which is what the incremental live path needs.

/** Streaming one-sided local-linear trend estimator; O(1) per sample. */
export class CausalTrendFilter {
  // Weighted sums over past samples of 1, u, u², y, u·y, with u = t_j − t_now (≤ 0) and y shifted
  // by the first value to keep the sums small.
  private s0 = 0
  private su = 0
  private suu = 0
  private sy = 0
  private suy = 0
  private lastTime = Number.NaN
  private yShift = Number.NaN
  // Regular sampling repeats the same step, so its decay factor is computed once.
  private lastStep = Number.NaN
  private lastDecay = 1

  constructor(private readonly bandwidth: number) {
    if (!(bandwidth > 0)) throw new RangeError(`trend bandwidth must be positive, got ${bandwidth}`)
  }

  /** Adds a sample and returns the trend at its time (the residual is value − trend). */
  push(time: number, value: number): number {
    if (Number.isNaN(this.yShift)) {
      this.yShift = value
      this.lastTime = time
    }
    const step = time - this.lastTime
    if (step < 0) throw new RangeError(`time went backwards at ${time}`)
    this.moveOriginForward(step)
    this.lastTime = time
    const y = value - this.yShift
    this.s0 += 1
    this.sy += y
    return this.yShift + this.interceptAtNow()
  }

  private moveOriginForward(step: number): void {
    if (step === 0) return
    if (step !== this.lastStep) {
      this.lastStep = step
      this.lastDecay = Math.exp(-step / this.bandwidth)
    }
    const decay = this.lastDecay
    // u → u − step for every stored sample, then every weight is multiplied by the decay.
    this.suu = decay * (this.suu - 2 * step * this.su + step * step * this.s0)
    this.suy = decay * (this.suy - step * this.sy)
    this.su = decay * (this.su - step * this.s0)
    this.s0 *= decay
    this.sy *= decay
  }

  private interceptAtNow(): number {
    const determinant = this.s0 * this.suu - this.su * this.su
    // Until the past spans enough time to fix a slope, the weighted mean is the best estimate.
    if (!(determinant > 1e-12 * this.s0 * this.suu)) return this.sy / this.s0
    return (this.suu * this.sy - this.su * this.suy) / determinant
  }
}
