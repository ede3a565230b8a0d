// Detection study of the LIVE early-warning alarm (docs/science.md §S8.1: calibrate the whole
// monitoring procedure, on-delay included, not one test). Every series below goes through
// shared/pipeline/evaluateRecord with the settings the server gives the tag
// (defaultIndicatorSettings of its sample period), then through the demo rules' condition tracker
// (on-delay in evaluations), exactly as the scheduled task would process it. Prints false alarms
// per tag-week on nulls (with a one-sided 95% Poisson upper bound), detection rate and median lead
// time on fold approaches, and how the fold horizon's band covers the true fold time.
import { poissonUpper95 } from '../../shared/analysis/calibration'
import { createRng } from '../../shared/analysis/random'
import type { Rng } from '../../shared/analysis/random'
import { simulateFold, simulateOu } from '../../shared/analysis/simulate'
import type { SampledSeries } from '../../shared/analysis/simulate'
import { evaluateRecord, type EvaluationPoint } from '../../shared/pipeline/evaluateRecord'
import {
  defaultIndicatorSettings, EARLY_WARNING_DELAYS, evaluationIntervalS, FOLD_IN_VIEW_DELAYS,
  type EvaluationDelays, type IndicatorSettings,
} from '../../shared/pipeline/indicatorDefaults'
import { ruleActivations } from '../../shared/pipeline/ruleReplay'
import { CATALOGUE, type UnitCode } from '../../shared/demo/catalogue'
import { seededNormal } from '../../simulators/lib/random'
import { UnitSampler } from '../../simulators/lib/unitSampler'
import { createUnit } from '../../simulators/units/createUnit'

const WEEK_S = 7 * 86400
/** The steady unit and the OU nulls are sampled every 60 s, as in the e2e steady-unit test. */
const NULL_PERIOD_S = 60

export interface LiveRun {
  points: EvaluationPoint[]
  slowingDown: number[]
  foldInView: number[]
}

export interface StudyOptions {
  settings?: (samplePeriodS: number) => IndicatorSettings
  earlyWarning?: EvaluationDelays
  foldInView?: EvaluationDelays
  /** Threshold (s) of the fold-in-view rule. */
  foldThresholdS?: number
}

/** One tag's record through the live evaluation and the two early-warning demo rules. */
export function liveRun(series: SampledSeries, samplePeriodS: number, tagId: number, options: StudyOptions = {}): LiveRun {
  const settings = (options.settings ?? defaultIndicatorSettings)(samplePeriodS)
  const { points } = evaluateRecord({
    tagId, times: series.times, values: series.values, firstNew: 0, samplesSinceEvaluation: 0, samplePeriodS, settings,
  })
  const interval = evaluationIntervalS(settings, samplePeriodS)
  const condition = (delays: EvaluationDelays, comparison: 'above' | 'below', threshold: number, deadband: number) => ({
    comparison, threshold, deadband, onDelayS: delays.onDelayEvaluations * interval, offDelayS: delays.offDelayEvaluations * interval,
  })
  return {
    points,
    slowingDown: ruleActivations(points, 'early_warning', condition(options.earlyWarning ?? EARLY_WARNING_DELAYS, 'above', 0.5, 0)),
    foldInView: ruleActivations(points, 'fold_horizon', condition(options.foldInView ?? FOLD_IN_VIEW_DELAYS, 'below', options.foldThresholdS ?? 900, 300)),
  }
}

// ---------------------------------------------------------------------------------------------
// Null series: nothing loses stability, so every raise is a false alarm.

/** A demo unit's tags as the server receives them (sensor noise and quantisation included). */
export function demoUnitRecord(
  code: UnitCode, seed: number, untilS: number, periodS?: number
): { tags: Map<string, SampledSeries>, tipS: number | null, foldS: number | null } {
  const base = CATALOGUE.find(u => u.code === code)!
  const catalogue = { ...base, tags: base.tags.map(t => ({ ...t, samplePeriodSeconds: periodS ?? t.samplePeriodSeconds })) }
  const unit = createUnit(code, { speed: 1, normal: seededNormal(seed) })
  const sampler = new UnitSampler(unit, catalogue, seededNormal(seed + 100), 0)
  const raw = new Map(catalogue.tags.map(t => [t.code, { t: [] as number[], v: [] as number[] }]))
  let tipS: number | null = null
  const stepMs = 60_000
  for (let ms = stepMs; ms <= untilS * 1000 && tipS === null; ms += stepMs) {
    for (const s of sampler.samplesUntil(ms)) {
      const r = raw.get(s.tag)!
      r.t.push(Date.parse(s.time) / 1000)
      r.v.push(s.value)
    }
    if (unit.cycle?.phase === 'tipped') tipS = ms / 1000
  }
  const tags = new Map([...raw].map(([tag, r]) => [tag, { times: Float64Array.from(r.t), values: Float64Array.from(r.v) }]))
  return { tags, tipS, foldS: null }
}

const WEEK_SAMPLES = WEEK_S / NULL_PERIOD_S
const OU_K = 1 / 600
const OU_SD = 1

function ouWeek(rng: Rng, options: { mean?: (t: number) => number, sigma?: (t: number) => number }): SampledSeries {
  return simulateOu({
    samples: WEEK_SAMPLES, dt: NULL_PERIOD_S, k: OU_K, sigma: options.sigma ?? OU_SD * Math.sqrt(2 * OU_K), mean: options.mean
  }, rng)
}

/** Null scenarios at 60 s: each returns one tag-week. */
export const NULL_SCENARIOS: { name: string, make: (rng: Rng) => SampledSeries }[] = [
  { name: 'trend-free OU (k = 1/600 s⁻¹)', make: rng => ouWeek(rng, {}) },
  {
    // An accelerating drift of the mean (8 SD over the week, cubic) plus a daily swing of 2 SD
    // (docs/science.md §S2.2: accelerating trends fool detrending).
    name: 'drifting-mean OU',
    make: rng => ouWeek(rng, { mean: t => OU_SD * (8 * (t / WEEK_S) ** 3 + 2 * Math.sin(2 * Math.PI * t / 86400)) }),
  },
  {
    // The noise amplitude doubles at a random time in days 3–5 (a pump change, a new feed):
    // variance rises, stability does not change (docs/science.md §S3.2).
    name: 'noise-level step ×2',
    make: (rng) => {
      const at = (3 + 2 * rng.uniform()) * 86400
      const sigma = OU_SD * Math.sqrt(2 * OU_K)
      return ouWeek(rng, { sigma: t => (t < at ? sigma : 2 * sigma) })
    },
  },
]

interface NullCount { tagWeeks: number, slowingDown: number, foldInView: number }

function report(name: string, c: NullCount): void {
  const rate = (n: number) => `${(n / c.tagWeeks).toFixed(3)} (≤ ${(poissonUpper95(n) / c.tagWeeks).toFixed(3)} at 95%)`
  console.log(`  ${name.padEnd(34)} ${c.tagWeeks} tag-weeks: slowing-down alerts ${c.slowingDown}, per tag-week ${rate(c.slowingDown)}; fold-in-view ${c.foldInView}`)
}

export function steadyUnitNulls(seeds: readonly number[], options: StudyOptions = {}): NullCount {
  const count: NullCount = { tagWeeks: 0, slowingDown: 0, foldInView: 0 }
  for (const seed of seeds) {
    const { tags } = demoUnitRecord('steady', seed, WEEK_S, NULL_PERIOD_S)
    let tagId = 1
    for (const series of tags.values()) {
      const run = liveRun(series, NULL_PERIOD_S, tagId++, options)
      count.tagWeeks++
      count.slowingDown += run.slowingDown.length
      count.foldInView += run.foldInView.length
    }
  }
  return count
}

export function scenarioNulls(make: (rng: Rng) => SampledSeries, tagWeeks: number, seed: number, options: StudyOptions = {}): NullCount {
  const rng = createRng(seed)
  const count: NullCount = { tagWeeks, slowingDown: 0, foldInView: 0 }
  for (let i = 0; i < tagWeeks; i++) {
    const run = liveRun(make(rng), NULL_PERIOD_S, 1000 + i, options)
    count.slowingDown += run.slowingDown.length
    count.foldInView += run.foldInView.length
  }
  return count
}

// ---------------------------------------------------------------------------------------------
// Fold approaches: the drifting demo units and the normal form.

export interface ApproachResult {
  name: string
  runs: number
  detected: number
  /** Lead times (s) of the first slowing-down alert before the tip. */
  leads: number[]
  /** Runs whose fold-in-view rule raised more than its threshold + band before the true fold. */
  earlyFoldAlarms: number
  /** Projections whose band contains the true fold time, of all projections. */
  bandHits: number
  projections: number
}

/** Demo units: the tag with the slowing-down rule, sampled at its own period, from a fresh start to the tip. */
const DEMO_APPROACHES: { unit: UnitCode, tag: string, foldMinutes: number }[] = [
  { unit: 'cstr', tag: 'TI-101', foldMinutes: 40 },
  { unit: 'digester', tag: 'FI-203', foldMinutes: 45 },
  { unit: 'grid', tag: 'EI-301', foldMinutes: 35 },
]

function scoreApproach(result: ApproachResult, run: LiveRun, tipS: number | null, foldS: number, foldThresholdS: number): void {
  result.runs++
  const tip = tipS ?? Number.POSITIVE_INFINITY
  const first = run.slowingDown.find(t => t < tip)
  if (first !== undefined) {
    result.detected++
    result.leads.push(tip - first)
  }
  if (run.foldInView.some(t => t < tip && foldS - t > 2 * foldThresholdS)) result.earlyFoldAlarms++
  for (const p of run.points) {
    if (p.fold.kind !== 'projected' || p.time >= tip) continue
    result.projections++
    if (p.time + p.fold.lowSeconds <= foldS && foldS <= p.time + p.fold.highSeconds) result.bandHits++
  }
}

export function demoApproaches(seeds: readonly number[], options: StudyOptions = {}): ApproachResult[] {
  return DEMO_APPROACHES.map(({ unit, tag, foldMinutes }) => {
    const period = CATALOGUE.find(u => u.code === unit)!.tags.find(t => t.code === tag)!.samplePeriodSeconds
    const result: ApproachResult = { name: `${unit} ${tag} (${period} s)`, runs: 0, detected: 0, leads: [], earlyFoldAlarms: 0, bandHits: 0, projections: 0 }
    for (const seed of seeds) {
      const record = demoUnitRecord(unit, seed, 3 * 3600)
      const run = liveRun(record.tags.get(tag)!, period, seed, options)
      scoreApproach(result, run, record.tipS, foldMinutes * 60, options.foldThresholdS ?? 900)
    }
    return result
  })
}

/**
 * ẋ = r(t) − x² + σξ in minutes (docs/science.md §S1.1), sampled every 60 s, r falling linearly from 0.04
 * to the fold r = 0 at t = 4 days (recovery time 2.5 min at the start). The tip is x < −0.3.
 */
export function normalFormApproaches(runs: number, seed: number, options: StudyOptions = {}): ApproachResult {
  const rng = createRng(seed)
  const result: ApproachResult = { name: 'normal form ẋ = r − x² (60 s)', runs: 0, detected: 0, leads: [], earlyFoldAlarms: 0, bandHits: 0, projections: 0 }
  const foldMinutes = 5760
  for (let i = 0; i < runs; i++) {
    const fold = simulateFold({
      samples: WEEK_SAMPLES, dt: 1, substeps: 10, r: t => 0.04 * (1 - t / foldMinutes), epsilon: 0, sigma: 0.01, tippedBelow: -0.3
    }, rng)
    const series = { times: Float64Array.from(fold.times, t => t * 60), values: fold.values }
    const run = liveRun(series, 60, 2000 + i, options)
    scoreApproach(result, run, fold.tipTime === null ? null : fold.tipTime * 60, foldMinutes * 60, options.foldThresholdS ?? 900)
  }
  return result
}

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted.length ? sorted[Math.floor((sorted.length - 1) / 2)]! : Number.NaN
}

function reportApproach(r: ApproachResult): void {
  const unit = r.leads.length && median(r.leads) > 3 * 3600 ? 3600 : 60
  console.log(`  ${r.name.padEnd(34)} detected before the tip ${r.detected}/${r.runs}, median lead ${(median(r.leads) / unit).toFixed(1)} ${unit === 60 ? 'min' : 'h'}; `
    + `fold-in-view raised > 2× threshold early in ${r.earlyFoldAlarms} runs; band holds the true fold in ${r.bandHits}/${r.projections} projections`)
}

export async function run(): Promise<void> {
  const started = performance.now()
  const s = defaultIndicatorSettings(NULL_PERIOD_S)
  console.log('Live early-warning alarm (evaluateRecord + demo rule delays), seeded simulations')
  console.log(`  settings: window ${s.windowSamples}, trend window ${s.trendWindowSamples}, every ${s.evaluateEvery} samples, ${s.surrogates} surrogates, α ${s.alpha}, first judgement after ${s.minTrendSamples} samples; `
    + `on-delay ${EARLY_WARNING_DELAYS.onDelayEvaluations} evaluations (a sliding look needs the one before it)`)
  report('steady unit T-400 (seeds 1–12)', steadyUnitNulls(Array.from({ length: 12 }, (_, i) => i + 1)))
  NULL_SCENARIOS.forEach((scenario, i) => report(scenario.name, scenarioNulls(scenario.make, 16, 7000 + i)))
  for (const result of demoApproaches([1, 2, 3, 4, 5, 6])) reportApproach(result)
  reportApproach(normalFormApproaches(8, 4242))
  console.log(`  (detection study took ${((performance.now() - started) / 1000).toFixed(1)} s)`)
}
