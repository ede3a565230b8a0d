// Early-warning detection study: the LIVE procedure beside the standard published pipeline
// (Dakos et al. 2012, PLoS ONE 7:e41010) on the same seeded records of published models ramped
// to their bifurcation, and on nulls. Quick mode runs the first records of every set.
import { defaultIndicatorSettings, EARLY_WARNING_DELAYS } from '../../../shared/pipeline/indicatorDefaults'
import { DAKOS_ALPHA, DAKOS_BANDWIDTH_FRACTION, DAKOS_WINDOW_FRACTION } from './dakosTrend'
import { FOLD_BAND, FOLD_WINDOW_FRACTION } from './dakosFold'
import { SAMPLE_PERIOD_S } from './liveProcedure'
import { CUT_BEFORE_ESCAPE_TAU } from './simulateModel'
import { BENCH_MODELS, characteristicTime } from './models'
import { MAX_STOP_TAU, RECORD_SAMPLES, studyRecords, type SetCounts } from './recordSets'
import { PRODUCT_ALPHA, scoreRecord, type ProcedureBudget, type RecordOutcome } from './scoreRecord'
import {
  printDetection, printDetectionByDistance, printDiscrimination, printFalsePositives, printLeadTimes, printMisses, printNoFoldOnNulls,
  printStreamRates, printTipProjections, printTipProjectionsByDistance,
} from './tables'

interface StudyPlan {
  counts: SetCounts
  budget: ProcedureBudget
}

// CPU per record, one core: the live procedure ~0.1 s on a short record and ~8 s on a long
// stream; the baseline monitor ~3 s more per long stream. Quick stays near 2 CPU-minutes by giving
// long streams to three of the AR(1)-based null kinds only: the slowest-memory AR(1), the
// accelerating drift and the noise step, the three classic false-alarm traps.
const QUICK: StudyPlan = {
  counts: {
    forcedShort: 20, modelNullShort: 20, nullShort: 8, forcedLong: 1, modelNullLong: 1, nullLong: 1,
    longNullKinds: ['AR(1) φ=0.9', 'accelerating drift 8 SD·(t/T)³', 'noise step ×2 at mid-record'],
  },
  budget: { surrogates: 199, bootstraps: 99 },
}
const FULL: StudyPlan = {
  counts: { forcedShort: 100, modelNullShort: 100, nullShort: 40, forcedLong: 6, modelNullLong: 3, nullLong: 3, longNullKinds: 'all' },
  budget: { surrogates: 999, bootstraps: 199 },
}

function printConventions(plan: StudyPlan, quick: boolean): void {
  const s = defaultIndicatorSettings(SAMPLE_PERIOD_S)
  const c = plan.counts
  console.log(`Early-warning detection study (${quick ? 'quick' : 'full'}): LIVE procedure vs Dakos et al. 2012 (PLoS ONE 7:e41010) on the same seeded records`)
  console.log(`  Conventions: one sample = 1 s = 1 model time unit (samplePeriodS = ${SAMPLE_PERIOD_S}); records of ${RECORD_SAMPLES.short} (short) and ${RECORD_SAMPLES.long} (long) samples;`)
  console.log(`  forced data stop U(0, ${MAX_STOP_TAU}) characteristic times τ = 1/|λ| at the record start before the bifurcation, the true tip.`)
  console.log(`  Where noise tipped a record before its planned end, the data stop ${CUT_BEFORE_ESCAPE_TAU}τ before the escape and lead times run to the escape. One tag-day = 86,400 samples.`)
  const longKinds = c.longNullKinds === 'all' ? 'every null kind' : c.longNullKinds.join('; ')
  console.log(`  Records per set: forced/own-null/each other null = ${c.forcedShort}/${c.modelNullShort}/${c.nullShort} short, ${c.forcedLong}/${c.modelNullLong}/${c.nullLong} long (long nulls: ${longKinds}).`)
  console.log(`  LIVE (scripts/bench/detection.ts liveRun → evaluateRecord, defaultIndicatorSettings(1)): window ${s.windowSamples}, trend window ${s.trendWindowSamples}, `
    + `every ${s.evaluateEvery} samples, ${s.surrogates} surrogates, α ${s.alpha} while the trend window grows; alert after ${EARLY_WARNING_DELAYS.onDelayEvaluations} + 1 evaluations of evidence `
    + `(a sliding look needs the one before it), clears after ${EARLY_WARNING_DELAYS.offDelayEvaluations}.`)
  console.log(`    Score = 1 − pAr1 and tip projection of the last evaluation point.`)
  console.log(`  Dakos: Gaussian kernel detrend, bandwidth ${100 * DAKOS_BANDWIDTH_FRACTION}% of the record; rolling window ${100 * DAKOS_WINDOW_FRACTION}%; Kendall τ of AR1 and variance; `
    + `${plan.budget.surrogates} AR(1) surrogates, p = (1 + #≥)/(N + 1), α ${DAKOS_ALPHA} (also ${PRODUCT_ALPHA}).`)
  console.log(`    Tip: λ = −ln r₁/Δt on ${100 * FOLD_WINDOW_FRACTION}% windows, λ² regressed on time over the last half, zero crossing, ${100 * FOLD_BAND}% band from ${plan.budget.bootstraps} parametric bootstraps.`)
  console.log(`    Monitor (long records): the same test on the latest ${s.trendWindowSamples} samples at every third live evaluation, ${s.surrogates} surrogates, raise when p ≤ α starts holding.`)
  for (const m of BENCH_MODELS) {
    console.log(`  Model ${m.name}: critical p = ${m.critical.toPrecision(5)} (computed), p0 = ${m.p0}, τ = ${characteristicTime(m).toPrecision(3)} s, σ = ${m.sigma}. ${m.source}`)
  }
}

export async function runStudy(quick: boolean): Promise<void> {
  const plan = quick ? QUICK : FULL
  const started = performance.now()
  const cpuStart = process.cpuUsage()
  printConventions(plan, quick)
  const outcomes: RecordOutcome[] = []
  for (const record of studyRecords(plan.counts)) outcomes.push(scoreRecord(record, plan.budget))
  printDiscrimination(outcomes)
  printDetection(outcomes)
  printDetectionByDistance(outcomes)
  printFalsePositives(outcomes)
  printLeadTimes(outcomes)
  printTipProjections(outcomes)
  printTipProjectionsByDistance(outcomes)
  printNoFoldOnNulls(outcomes)
  printStreamRates(outcomes)
  printMisses(outcomes)
  const cpu = process.cpuUsage(cpuStart)
  console.log(`\n  (${outcomes.length} records; ${((performance.now() - started) / 1000).toFixed(1)} s wall, ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s CPU)`)
}
