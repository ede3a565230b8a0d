// The seeded records of the study: each model ramped to its bifurcation (forced) or held at its
// start (its own null), and the AR(1)-based nulls, each at two lengths. A record's seed depends
// only on its set and index, so quick mode's records are the first ones of the full run.
import { createRng } from '../../../shared/analysis/random'
import type { SampledSeries } from '../../../shared/analysis/simulate'
import { BENCH_MODELS, characteristicTime } from './models'
import { NULL_KINDS } from './nullSeries'
import { simulateModel } from './simulateModel'

export type RecordLength = 'short' | 'long'
/** Short records as in the early-warning literature; long ones as a tag's stream. */
export const RECORD_SAMPLES: Record<RecordLength, number> = { short: 500, long: 10_000 }
/** The data stop U(0, MAX_STOP_TAU) characteristic times (1/|λ| at the record start) before the bifurcation. */
export const MAX_STOP_TAU = 150

export interface RecordMeta {
  /** Unique over the study: the tag id given to the live procedure. */
  id: number
  /** The model's name, or the null kind's. */
  group: string
  forced: boolean
  /** A model held at its start parameter (rather than an AR(1)-based null). */
  modelNull: boolean
  length: RecordLength
  samples: number
  lastTime: number
  /** Forced records: when the parameter reaches its critical value. */
  bifurcationTime: number | null
  /** Forced records that left the basin by noise before the data end. */
  escapeTime: number | null
  stopBeforeTau: number | null
  /** 1/|λ| at the record start (models only). */
  tau0: number | null
}

export interface StudyRecord extends RecordMeta {
  series: SampledSeries
}

export interface SetCounts {
  forcedShort: number
  modelNullShort: number
  nullShort: number
  forcedLong: number
  modelNullLong: number
  nullLong: number
  /** Which AR(1)-based null kinds get long streams (each costs ~10 CPU-seconds). */
  longNullKinds: 'all' | readonly string[]
  /** Samples per short record, when not RECORD_SAMPLES.short (the calibration also tries longer ones). */
  shortSamples?: number
}

/** A record's seed from its set and index (multiplicative hashing keeps the sets apart). */
const seedOf = (set: number, index: number) => (Math.imul(set + 1, 0x9E3779B1) ^ Math.imul(index + 1, 0x85EBCA77)) >>> 0

/**
 * Yields the records one at a time, so a long stream is dropped once it has been scored. Seeds run
 * from `firstIndex` within every set: the calibration draws from indices the benchmark never scores.
 */
export function* studyRecords(counts: SetCounts, firstIndex = 0): Generator<StudyRecord> {
  const unknown = counts.longNullKinds === 'all' ? [] : counts.longNullKinds.filter(name => !NULL_KINDS.some(k => k.name === name))
  if (unknown.length) throw new Error(`no null kind named ${unknown.join(', ')}`)
  let id = 1
  let set = 0
  for (const length of ['short', 'long'] as const) {
    const samples = length === 'short' ? counts.shortSamples ?? RECORD_SAMPLES.short : RECORD_SAMPLES.long
    const forcedRuns = length === 'short' ? counts.forcedShort : counts.forcedLong
    const modelNullRuns = length === 'short' ? counts.modelNullShort : counts.modelNullLong
    const nullRuns = length === 'short' ? counts.nullShort : counts.nullLong
    for (const model of BENCH_MODELS) {
      const tau0 = characteristicTime(model)
      for (const forced of [true, false]) {
        set++
        for (let i = 0; i < (forced ? forcedRuns : modelNullRuns); i++) {
          const rng = createRng(seedOf(set, firstIndex + i))
          const stopBeforeTau = forced ? MAX_STOP_TAU * rng.uniform() : null
          const run = simulateModel(model, { samples, stopBeforeTau }, rng)
          yield {
            id: id++, group: model.name, forced, modelNull: !forced, length, samples: run.values.length,
            lastTime: run.times[run.times.length - 1]!, bifurcationTime: run.bifurcationTime, escapeTime: run.escapeTime,
            stopBeforeTau, tau0, series: run,
          }
        }
      }
    }
    for (const kind of NULL_KINDS) {
      set++
      const included = length === 'short' || counts.longNullKinds === 'all' || counts.longNullKinds.includes(kind.name)
      for (let i = 0; i < (included ? nullRuns : 0); i++) {
        const series = kind.make(samples, createRng(seedOf(set, firstIndex + i)))
        yield {
          id: id++, group: kind.name, forced: false, modelNull: false, length, samples: series.values.length,
          lastTime: series.times[series.times.length - 1]!,
          bifurcationTime: null, escapeTime: null, stopBeforeTau: null, tau0: null, series,
        }
      }
    }
  }
}
