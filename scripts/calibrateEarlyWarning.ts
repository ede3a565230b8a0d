// Whole-procedure calibration of the live slowing-down alert (docs/science.md §S8.1). Every record
// goes once through shared/pipeline/evaluateRecord with the default settings; each look's
// stability-trend p and its sign conditions are kept, and the alert rule is then replayed for a
// grid of candidate decisions (α while the trend window grows, the false-alert budget once it
// slides, the on-delay) on the same looks. The records are the detection study's simulations
// (scripts/bench/detectionStudy/recordSets.ts) drawn from seed indices the benchmark never
// scores, so what is tuned here is measured there on fresh seeds.
//   npx tsx scripts/calibrateEarlyWarning.ts    (SHORT=150 LONG=8 records per set; GRID=α:budget:onDelay,…; TREND, EVERY;
//   SAMPLES=900 makes the short records that long: their nulls are also scored on their first
//   460, 600 and 750 samples, since a look only reads data up to its own time)
import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { INACTIVE, stepCondition } from '../shared/alarms/conditionTracker'
import { evaluateRecord } from '../shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings, EARLY_WARNING_DELAYS, slidingLookAlpha, trendWindowGrowing } from '../shared/pipeline/indicatorDefaults'
import { studyRecords, type StudyRecord } from './bench/detectionStudy/recordSets'
import { wilson } from './bench/detectionStudy/stats'

const env = (name: string, fallback: number) => (process.env[name] === undefined ? fallback : Number(process.env[name]))
const SHORT = env('SHORT', 150)
const LONG = env('LONG', 8)
const SAMPLES = env('SAMPLES', 500)
/** Prefix lengths at which short null records are also scored (those shorter than the record). */
const PREFIXES = [460, 600, 750].filter(n => n < SAMPLES)
/** The benchmark scores indices 0–99 of every set; calibration starts well past them. */
const FIRST_INDEX = 1_000
const DAY_S = 86_400

interface Look {
  time: number
  /** Usable samples in the trend window. */
  trendSamples: number
  p: number
  /** φ rising and variance not falling: the look says slowing down once p ≤ its α. */
  risingTogether: boolean
}

interface Candidate {
  expandingAlpha: number
  /** False slowing-down alerts per tag-day the sliding phase may spend (slidingLookAlpha). */
  budgetPerTagDay: number
  onDelay: number
}

// TREND=samples EVERY=samples try another largest trend window and evaluation interval on the same records.
const settings = {
  ...defaultIndicatorSettings(1),
  alpha: 1,
  ...(process.env.TREND ? { trendWindowSamples: env('TREND', 0) } : {}),
  ...(process.env.EVERY ? { evaluateEvery: env('EVERY', 0) } : {}),
}

function looksOf(record: StudyRecord): Look[] {
  const { times, values } = record.series
  const { points } = evaluateRecord({
    tagId: record.id, times, values, firstNew: 0, samplesSinceEvaluation: 0, samplePeriodS: 1, settings, slidingAlpha: 1
  })
  // These records hold no step, so the usable data start one detrend bandwidth after the first sample.
  const usableFrom = times[0]! + settings.detrendBandwidthS
  return points.filter(pt => pt.pAr1 !== null).map(pt => ({
    time: pt.time,
    trendSamples: Math.min(pt.time - usableFrom + 1, settings.trendWindowSamples),
    p: pt.pAr1!,
    risingTogether: pt.evidence === 'slowing down',
  }))
}

/** α of a sliding look for the candidate's budget (settings.alpha is 1 here, so no cap applies). */
const slidingAlphaOf = (candidate: Candidate) => slidingLookAlpha(settings, 1, candidate.budgetPerTagDay)

/** Raises of the rule over one record's looks, with the live rule's condition tracker. */
function raises(looks: readonly Look[], candidate: Candidate, slidingAlpha: number): number[] {
  const interval = settings.evaluateEvery
  const condition = {
    comparison: 'above' as const, threshold: 0.5, deadband: 0,
    onDelayS: candidate.onDelay * interval, offDelayS: EARLY_WARNING_DELAYS.offDelayEvaluations * interval,
  }
  let state = INACTIVE
  const times: number[] = []
  const alphaOf = (look: Look) => (trendWindowGrowing(settings, look.trendSamples) ? candidate.expandingAlpha : slidingAlpha)
  for (const [i, look] of looks.entries()) {
    // A sliding look needs the look before it to pass too (evaluateRecord confirmedEvidence; with
    // α 1 here the engine only checked that it rose together, so its α is applied now).
    const previous = looks[i - 1]
    const confirmed = trendWindowGrowing(settings, look.trendSamples) || (previous !== undefined && previous.p <= alphaOf(previous))
    const step = stepCondition(condition, state, look.time, look.risingTogether && look.p <= alphaOf(look) && confirmed ? 1 : 0)
    state = step.state
    if (step.change === 'activate') times.push(look.time)
  }
  return times
}

interface Group {
  name: string
  forced: boolean
  length: 'short' | 'long'
  looks: Look[][]
  samples: number
}

function collect(): Group[] {
  const groups = new Map<string, Group>()
  const started = Date.now()
  let done = 0
  const counts = {
    forcedShort: SHORT, modelNullShort: SHORT, nullShort: SHORT, forcedLong: LONG, modelNullLong: LONG, nullLong: LONG,
    longNullKinds: 'all' as const, shortSamples: SAMPLES,
  }
  for (const record of studyRecords(counts, FIRST_INDEX)) {
    const key = `${record.group}|${record.forced}|${record.length}`
    const group = groups.get(key) ?? { name: record.group, forced: record.forced, length: record.length, looks: [], samples: 0 }
    groups.set(key, group)
    group.looks.push(looksOf(record))
    group.samples += record.samples
    if (++done % 200 === 0) process.stderr.write(`  ${done} records, ${((Date.now() - started) / 1000).toFixed(0)} s\n`)
  }
  return [...groups.values()]
}

const pct = (k: number, n: number) => {
  const { low, high } = wilson(k, n)
  return `${String(k).padStart(3)}/${n} [${(100 * low).toFixed(0)}–${(100 * high).toFixed(0)}]`
}

function report(groups: readonly Group[], candidate: Candidate): void {
  const slidingAlpha = slidingAlphaOf(candidate)
  console.log(`\nexpanding α ${candidate.expandingAlpha}, sliding budget ${candidate.budgetPerTagDay}/tag-day (look α ${slidingAlpha.toExponential(1)} at 1 s), on-delay ${candidate.onDelay}`)
  for (const g of groups) {
    const perRecord = g.looks.map(l => raises(l, candidate, slidingAlpha))
    const alerted = perRecord.filter(r => r.length > 0).length
    const total = perRecord.reduce((s, r) => s + r.length, 0)
    const windows = g.samples / settings.trendWindowSamples
    const rate = g.length === 'long' && !g.forced
      ? `  ${(1000 * total / (g.samples / DAY_S)).toFixed(0)} per 1,000 tag-days at 1 s, ${(total / windows / slidingAlpha).toFixed(1)} per window per α`
      : g.forced ? '' : PREFIXES.map(n => `  by ${n}: ${pct(perRecord.filter(r => r.some(t => t < n)).length, perRecord.length)}`).join('')
    console.log(`  ${(g.forced ? 'FORCED ' : 'null   ') + g.name.padEnd(34)} ${g.length.padEnd(5)} ${pct(alerted, perRecord.length)}${rate}`)
  }
}

// CACHE=file keeps the looks, so further decision grids replay them without re-evaluating.
const cache = process.env.CACHE
const groups: Group[] = cache && existsSync(cache) ? JSON.parse(readFileSync(cache, 'utf8')) : collect()
if (cache && !existsSync(cache)) writeFileSync(cache, JSON.stringify(groups))
const grid = (process.env.GRID ?? '0.005:0.02:1,0.008:0.02:1,0.01:0.02:1,0.004:0.02:0,0.005:0.02:0').split(',')
for (const entry of grid) {
  const [expandingAlpha, budgetPerTagDay, onDelay] = entry.split(':').map(Number) as [number, number, number]
  report(groups, { expandingAlpha, budgetPerTagDay, onDelay })
}
