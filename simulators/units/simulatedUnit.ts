import type { UnitCode } from '../../shared/demo/catalogue'
import { DriftCycle, type DriftCycleSettings, type DriftPhase } from '../lib/driftCycle'
import { integrate, type Derivative } from '../lib/eulerMaruyama'
import type { Normal } from '../lib/random'

/** A plant unit as the runner sees it: advance wall time, read true process values by tag. */
export interface SimulatedUnit {
  readonly code: UnitCode
  /** Advance the plant by this much wall-clock time; the unit applies its own time compression. */
  advance(wallSeconds: number): void
  /** True (noise-free at the sensor) process values, by tag code. */
  trueValues(): Record<string, number>
  /** Short human-readable state for the status line. */
  describe(): string
  /** Present on drifting units. */
  readonly cycle?: DriftCycle
}

export interface UnitOptions {
  /** Multiplier on the unit's demo pace: 2 reaches the fold in half the wall time. */
  speed: number
  /** Process noise stream for this unit. */
  normal: Normal
}

/** What makes one drifting plant different from another; the shared machinery is below. */
export interface DriftingPlantSpec {
  code: UnitCode
  /** Model time units per wall-clock second at speed 1 (the demo's time compression). */
  modelTimePerWallSecond: number
  /** Largest Euler–Maruyama step, model time units (small against the fastest mode). */
  maxStep: number
  noiseSd: number[]
  cycle: DriftCycleSettings
  derivative(parameter: number): Derivative
  /** Where operators bring the plant back to after a tip. */
  restingState(parameter: number): number[]
  hasTipped(state: readonly number[]): boolean
  /** False when protection stops the process once it has tipped (e.g. load shedding). */
  integrateWhileTipped: boolean
  trueValues(state: readonly number[], phase: DriftPhase): Record<string, number>
  describe(state: readonly number[], parameter: number, phase: DriftPhase): string
}

export function createDriftingUnit(
  spec: DriftingPlantSpec, options: UnitOptions
): SimulatedUnit & { readonly cycle: DriftCycle; state(): number[] } {
  const cycle = new DriftCycle(spec.cycle)
  let state = spec.restingState(cycle.parameter)
  const modelTimePerWallSecond = spec.modelTimePerWallSecond * options.speed
  return {
    code: spec.code,
    cycle,
    state: () => [...state],
    advance(wallSeconds) {
      const duration = wallSeconds * modelTimePerWallSecond
      if (cycle.phase === 'approach' || spec.integrateWhileTipped)
        state = integrate(state, spec.derivative(cycle.parameter), spec.noiseSd, duration, spec.maxStep, options.normal)
      if (cycle.phase === 'approach' && spec.hasTipped(state)) cycle.markTipped()
      if (cycle.advance(duration)) state = spec.restingState(cycle.parameter)
    },
    trueValues: () => spec.trueValues(state, cycle.phase),
    describe: () => spec.describe(state, cycle.parameter, cycle.phase),
  }
}
