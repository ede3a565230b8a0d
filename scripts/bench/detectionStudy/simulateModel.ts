// Euler–Maruyama runs (Kloeden & Platen 1992, Numerical Solution of Stochastic Differential
// Equations, Springer) of a benchmark model, either ramped linearly to its bifurcation or held at
// its starting parameter (the model's own null). One sample per model time unit, so samplePeriodS
// = 1 and "seconds" below are model time units.
import type { Rng } from '../../../shared/analysis/random'
import type { SampledSeries } from '../../../shared/analysis/simulate'
import { characteristicTime, type BenchModel } from './models'

/** Integration steps per sample: h = 0.05 keeps |λ|·h ≤ 0.05 for every model here. */
const SUBSTEPS = 20
/** Burn-in at the start parameter, in characteristic times, so the record starts stationary. */
const BURN_IN_TAU = 20
/**
 * A record that tips by noise before its planned end is cut this many characteristic times before
 * the escape: the excursion out of the basin took 5–35 s in trial runs, and a warning that only
 * sees the transition itself is no early warning.
 */
export const CUT_BEFORE_ESCAPE_TAU = 30

export interface ModelRecord extends SampledSeries {
  /** Time the parameter reaches its critical value; null when it is held fixed. */
  bifurcationTime: number | null
  /** Time the state left the basin (the data stop CUT_BEFORE_ESCAPE_TAU·τ before), else null. */
  escapeTime: number | null
  /** How far before the bifurcation the data were set to stop, in characteristic times. */
  stopBeforeTau: number | null
}

export interface ModelRunOptions {
  samples: number
  /** Ramp to the bifurcation, stopping this many characteristic times before it; null holds p0. */
  stopBeforeTau: number | null
}

export function simulateModel(model: BenchModel, options: ModelRunOptions, rng: Rng): ModelRecord {
  const tau = characteristicTime(model)
  const lastSampleTime = options.samples - 1
  const bifurcationTime = options.stopBeforeTau === null ? null : lastSampleTime + options.stopBeforeTau * tau
  const parameter = (t: number) => (bifurcationTime === null
    ? model.p0
    : model.p0 + (model.critical - model.p0) * Math.max(0, t) / bifurcationTime)
  const h = 1 / SUBSTEPS
  const noise = model.sigma * Math.sqrt(h)
  let x = model.equilibrium(model.p0)
  for (let step = 0; step < BURN_IN_TAU * tau * SUBSTEPS; step++) x += model.drift(x, model.p0) * h + noise * rng.normal()
  const times: number[] = []
  const values: number[] = []
  let escapeTime: number | null = null
  for (let i = 0; i < options.samples && escapeTime === null; i++) {
    times.push(i)
    values.push(x)
    for (let s = 0; s < SUBSTEPS; s++) {
      const t = i + s * h
      x += model.drift(x, parameter(t)) * h + noise * rng.normal()
      if (model.hasTipped(x)) { escapeTime = t + h; break }
    }
  }
  const keep = escapeTime === null ? times.length : Math.max(2, times.filter(t => t <= escapeTime! - CUT_BEFORE_ESCAPE_TAU * tau).length)
  return {
    times: Float64Array.from(times.slice(0, keep)), values: Float64Array.from(values.slice(0, keep)),
    bifurcationTime, escapeTime, stopBeforeTau: options.stopBeforeTau,
  }
}
