// One tag's share of a pipeline tick, as pure computation over the samples the tick loaded:
// causal detrending, then at every `evaluateEvery`-th new sample the quality gate, the window's
// indicators, the surrogate trend tests with the early-warning judgement, and the fold horizon.
import { causalLocalLinearTrend } from '../analysis/detrend'
import { judgeTrends, type TrendEvidence } from '../analysis/earlyWarningDecision'
import { foldHorizon, recoveryRateSe, type RatePoint } from '../analysis/foldHorizon'
import { indicatorSeries } from '../analysis/indicatorSeries'
import { indicatorsFromSums } from '../analysis/indicators'
import { accurateMean, centredSums } from '../analysis/moments'
import { checkQuality, DEFAULT_QUALITY_LIMITS } from '../analysis/quality'
import { createRng } from '../analysis/random'
import { surrogateTrendTest } from '../analysis/trendTest'
import type { IndicatorSettings } from './indicatorDefaults'

export interface EvaluationPoint {
  /** Seconds since the epoch: the newest sample of the window. */
  time: number
  /** null when the window passed the quality gate, else the reason it failed. */
  quality: string | null
  variance: number | null
  std: number | null
  cv: number | null
  ar1: number | null
  recoveryRate: number | null
  skewness: number | null
  kurtosis: number | null
  tauAr1: number | null
  pAr1: number | null
  tauVariance: number | null
  pVariance: number | null
  /** null until the trend window is full (or when the gate failed). */
  evidence: TrendEvidence | null
  fold: { kind: 'projected', seconds: number, lowSeconds: number, highSeconds: number } | { kind: 'none' }
}

export type PipelineStage = 'detrend' | 'quality and indicators' | 'trend tests' | 'fold horizon'
/** Measures a synchronous stage; the engine's stages are PipelineStage, callers may add their own. */
export type StageTimer = <T>(stage: PipelineStage | (string & {}), work: () => T) => T
const untimed: StageTimer = (_stage, work) => work()

export interface RecordInput {
  tagId: number
  /** Sample times (s) ascending: history already processed, then the new samples. */
  times: Float64Array
  values: Float64Array
  /** Index of the first new sample. */
  firstNew: number
  /** New samples counted toward the next evaluation before this record. */
  samplesSinceEvaluation: number
  samplePeriodS: number
  settings: IndicatorSettings
}

/** Significance of the fold-horizon slope and coverage of its band. */
const FOLD_ALPHA = 0.01
const FOLD_CONFIDENCE = 0.9

/** Evaluates a tag over its new samples; returns the evaluation points and the carried count. */
export function evaluateRecord(input: RecordInput, time: StageTimer = untimed): { points: EvaluationPoint[], samplesSinceEvaluation: number } {
  const { times, values, settings } = input
  const residuals = time('detrend', () => {
    const trend = causalLocalLinearTrend(times, values, settings.detrendBandwidthS)
    return Float64Array.from(values, (v, i) => v - trend[i]!)
  })
  const points: EvaluationPoint[] = []
  let counter = input.samplesSinceEvaluation
  for (let i = input.firstNew; i < values.length; i++) {
    if (++counter < settings.evaluateEvery) continue
    counter = 0
    points.push(evaluateAt(input, residuals, i, time))
  }
  return { points, samplesSinceEvaluation: counter }
}

function evaluateAt(input: RecordInput, residuals: Float64Array, end: number, time: StageTimer): EvaluationPoint {
  const { times, values, settings } = input
  const w = settings.windowSamples
  const start = end + 1 - w
  const empty = emptyPoint(times[end]!)
  if (start < 0) return { ...empty, quality: `too few samples: ${end + 1} of ${w}` }
  const limits = { ...DEFAULT_QUALITY_LIMITS, minSamples: Math.min(DEFAULT_QUALITY_LIMITS.minSamples, w), maxGapSeconds: 10 * input.samplePeriodS }
  const current = time('quality and indicators', () => {
    const verdict = checkQuality(times.subarray(start, end + 1), values.subarray(start, end + 1), limits)
    if (!verdict.ok) return { quality: `${verdict.failed}: ${verdict.reason}` as const, indicators: null }
    return {
      quality: null,
      indicators: indicatorsFromSums(centredSums(residuals, start, end + 1), {
        dt: (times[end]! - times[start]!) / (w - 1),
        levelMean: accurateMean(values, start, end + 1),
      }),
    }
  })
  if (!current.indicators) return { ...empty, quality: current.quality }
  const ind = current.indicators
  const point: EvaluationPoint = {
    ...empty,
    variance: finite(ind.variance),
    std: finite(ind.sd),
    cv: finite(ind.cv),
    ar1: finite(ind.ar1),
    recoveryRate: ind.recovery.status === 'ok' ? ind.recovery.rate : null,
    skewness: finite(ind.skewness),
    kurtosis: finite(ind.kurtosis),
  }
  const trendStart = end + 1 - settings.trendWindowSamples
  if (trendStart < 0) return point
  const trendTimes = times.subarray(trendStart, end + 1)
  const trendResiduals = residuals.subarray(trendStart, end + 1)
  const tests = time('trend tests', () => surrogateTrendTest(trendTimes, trendResiduals, {
    window: { kind: 'count', samples: w },
    step: settings.indicatorStep,
    surrogates: settings.surrogates,
    kind: 'ar1',
    indicators: ['ar1', 'variance'],
  }, createRng(seedFor(input.tagId, times[end]!))))
  const evidence = judgeTrends(tests.ar1!, tests.variance!, { alpha: settings.alpha, minTau: settings.minTau, onDelay: 1, offDelay: 1 })
  const fold = time('fold horizon', () => foldOf(trendTimes, trendResiduals, settings, times[end]!))
  return {
    ...point,
    tauAr1: finite(tests.ar1!.tau),
    pAr1: tests.ar1!.p,
    tauVariance: finite(tests.variance!.tau),
    pVariance: tests.variance!.p,
    evidence,
    fold,
  }
}

/**
 * The fold fit uses shorter windows than the indicators: a line needs several independent
 * estimates (with the 3 windows of the trend window it had one degree of freedom left, and a
 * projection needed t > 31.8). Six windows leave four; their k̂ is √2 noisier than a 300-sample one.
 */
const FOLD_WINDOWS = 6
function foldWindowSamples(settings: IndicatorSettings): number {
  return Math.floor(settings.trendWindowSamples / FOLD_WINDOWS)
}

/** Recovery rates of the windows inside the trend window, extrapolated to zero (SCIENCE.md A1). */
function foldOf(times: Float64Array, residuals: Float64Array, settings: IndicatorSettings, now: number): EvaluationPoint['fold'] {
  const w = foldWindowSamples(settings)
  const series = indicatorSeries(times, residuals, { window: { kind: 'count', samples: w }, step: settings.indicatorStep })
  const dt = (times[times.length - 1]! - times[0]!) / (times.length - 1)
  const points: RatePoint[] = []
  // A window's rate describes its middle, not its newest sample: labelling it at the end would
  // shift the whole line, and the projected fold, half a window late.
  const halfWindow = (w - 1) * dt / 2
  series.time.forEach((t, k) => {
    const rate = series.recoveryRate[k]!
    if (Number.isFinite(rate)) points.push({ time: t - halfWindow, rate, se: recoveryRateSe(rate, dt, w) })
  })
  const horizon = foldHorizon(points, { windowSeconds: w * dt, alpha: FOLD_ALPHA, confidence: FOLD_CONFIDENCE, now })
  if (horizon.kind !== 'fold in view') return { kind: 'none' }
  return { kind: 'projected', seconds: horizon.horizon, lowSeconds: horizon.low - now, highSeconds: horizon.high - now }
}

function emptyPoint(time: number): EvaluationPoint {
  return {
    time, quality: null, variance: null, std: null, cv: null, ar1: null, recoveryRate: null, skewness: null, kurtosis: null,
    tauAr1: null, pAr1: null, tauVariance: null, pVariance: null, evidence: null, fold: { kind: 'none' },
  }
}

const finite = (x: number | null): number | null => (x !== null && Number.isFinite(x) ? x : null)

/** Reproducible surrogates: the same tag and evaluation time always draw the same series. */
function seedFor(tagId: number, time: number): number {
  return (Math.imul(tagId, 0x9E3779B1) ^ Math.floor(time)) >>> 0
}
