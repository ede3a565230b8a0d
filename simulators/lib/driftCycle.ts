// The demo's story for a drifting unit: a parameter creeps linearly toward its fold, the plant
// tips some time after crossing it, stays tipped for a while (so the event is visible on the
// charts), then operators recover it and the creep starts again from the beginning.

export interface DriftCycleSettings {
  /** Parameter value at the start of each approach. */
  start: number
  /** Parameter value at the fold (from the model's fold helper). */
  fold: number
  /** Process time from start to fold, in the model's own time unit. */
  timeToFold: number
  /** Process time the plant stays tipped before it is reset. */
  holdAfterTip: number
  /** How far past the fold the creep may go, as a fraction of (fold − start); it stops there. */
  maxOvershoot?: number
}

export type DriftPhase = 'approach' | 'tipped'

export class DriftCycle {
  private elapsed = 0
  private tippedFor = 0
  phase: DriftPhase = 'approach'
  /** Completed approach–tip–reset cycles. */
  completedCycles = 0

  constructor(private readonly settings: DriftCycleSettings) {}

  get parameter(): number {
    const { start, fold, timeToFold, maxOvershoot = 0.5 } = this.settings
    const progress = Math.min(this.elapsed / timeToFold, 1 + maxOvershoot)
    return start + (fold - start) * progress
  }

  /** Fraction of the way from start to fold (1 at the fold). */
  get progressToFold(): number {
    return this.elapsed / this.settings.timeToFold
  }

  /** Advance process time; returns true when the tipped hold is over and the plant must be reset. */
  advance(processTime: number): boolean {
    if (this.phase === 'approach') {
      this.elapsed += processTime
      return false
    }
    this.tippedFor += processTime
    if (this.tippedFor < this.settings.holdAfterTip) return false
    this.elapsed = 0
    this.tippedFor = 0
    this.phase = 'approach'
    this.completedCycles++
    return true
  }

  markTipped(): void {
    this.phase = 'tipped'
  }
}
