// One tag's share of a pipeline tick, as pure computation over the samples the tick loaded:
// causal detrending restarted after steps, then at every `evaluateEvery`-th new sample the
// quality gate, the window's indicators, the stability-trend test with the early-warning
// judgement, and the fold horizon. Windows expand: a tag is judged once `minTrendSamples`
// usable samples follow its warm-up, and the trend window grows from there to its full size.
import { judgeEvidence, varianceChange, type TrendEvidence, type VarianceChange } from '../analysis/earlyWarningDecision'
import { foldProfile } from '../analysis/foldProfile'
import { indicatorSeries } from '../analysis/indicatorSeries'
import { indicatorsFromSums } from '../analysis/indicators'
import { trendTau } from '../analysis/kendall'
import { accurateMean, centredSums } from '../analysis/moments'
import { checkQuality, DEFAULT_QUALITY_LIMITS } from '../analysis/quality'
import { createRng } from '../analysis/random'
import { segmentedResiduals } from '../analysis/segmentedResiduals'
import { stabilityTrendTest, type StabilityTrendTest } from '../analysis/stabilityTrend'
import { windowResiduals } from '../analysis/windowDetrend'
import { slidingLookAlpha, trendWindowGrowing, type IndicatorSettings } from './indicatorDefaults'

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
  /** null until `minTrendSamples` usable samples follow the warm-up (or when the gate failed). */
  evidence: TrendEvidence | null
  fold: { kind: 'projected', seconds: number, lowSeconds: number, highSeconds: number } | { kind: 'none' }
}

/** The quality note of an evaluation inside the warm-up after a detected step. */
export const SETTLING = 'settling after a step'
/** The quality note's start inside the warm-up after the first sample loaded. */
export const WARMING_UP = 'warming up'

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
  /** α of a look once the trend window slides; by default the tag's false-alert budget share (calibration sets its own). */
  slidingAlpha?: number
}

/**
 * The fold horizon is fitted once the stability trend reaches this p (looser than the alarm's α:
 * it says where a fold would lie, the alarm says whether to act), with a 90% band.
 */
const FOLD_GATE_P = 0.05
const FOLD_CONFIDENCE = 0.9

/** Evaluates a tag over its new samples; returns the evaluation points and the carried count. */
export function evaluateRecord(
  input: RecordInput, time: StageTimer = untimed,
): { points: EvaluationPoint[], samplesSinceEvaluation: number } {
  const { times, values, settings } = input
  const detrended = time('detrend', () => segmentedResiduals(times, values, settings.detrendBandwidthS))
  const points: EvaluationPoint[] = []
  let counter = input.samplesSinceEvaluation
  for (let i = input.firstNew; i < values.length; i++) {
    if (++counter < settings.evaluateEvery) continue
    counter = 0
    points.push(evaluateAt(input, detrended.residuals, detrended.usableFrom, i, time))
  }
  return { points, samplesSinceEvaluation: counter }
}

function evaluateAt(input: RecordInput, residuals: Float64Array, usableFrom: Int32Array, end: number, time: StageTimer): EvaluationPoint {
  const { times, values, settings } = input
  const empty = emptyPoint(times[end]!)
  const usable = usableFrom[end]!
  if (end < usable) {
    return { ...empty, quality: usableFrom[0] !== usable ? SETTLING : `${WARMING_UP}: ${end + 1} samples` }
  }
  const start = Math.max(end + 1 - settings.windowSamples, usable)
  const w = end + 1 - start
  const limits = {
    ...DEFAULT_QUALITY_LIMITS,
    minSamples: Math.min(DEFAULT_QUALITY_LIMITS.minSamples, settings.windowSamples),
    maxGapSeconds: 10 * input.samplePeriodS,
  }
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
  const trendStart = Math.max(end + 1 - settings.trendWindowSamples, usable)
  if (end + 1 - trendStart < settings.minTrendSamples) return point
  const trendTimes = times.subarray(trendStart, end + 1)
  const look = judgeLook(input, trendStart, end, time)
  const trendResiduals = look.residuals
  const judged = { ...look, evidence: confirmedEvidence(input, look, trendStart, end, usable, time) }
  const taus = time('trend tests', () => displayTaus(trendTimes, trendResiduals, settings))
  const rising = judged.stability.fit.slope > 0
  const fold = rising && judged.stability.p <= FOLD_GATE_P
    // The horizon is fitted to the causal residuals: on the window's own residuals the end effect
    // of the kernel smooth (windowDetrend.ts) made the band miss the lake fold on 5 of 8 projections.
    ? time('fold horizon', () => foldOf(trendTimes, residuals.subarray(trendStart, end + 1), times[end]!))
    : { kind: 'none' as const }
  return {
    ...point,
    tauAr1: taus.ar1,
    pAr1: judged.stability.p,
    tauVariance: taus.variance,
    pVariance: judged.variance.p,
    evidence: judged.evidence,
    fold,
  }
}

interface Look {
  residuals: Float64Array
  stability: StabilityTrendTest
  variance: VarianceChange
  alpha: number
  evidence: TrendEvidence
}

/** The trend tests on the window [trendStart, end], detrended on its own (analysis/windowDetrend). */
function judgeLook(input: RecordInput, trendStart: number, end: number, time: StageTimer): Look {
  const { times, values, settings } = input
  const residuals = time('detrend', () => windowResiduals(times, values, trendStart, end + 1))
  return time('trend tests', () => {
    const stability = stabilityTrendTest(residuals, settings.surrogates, createRng(seedFor(input.tagId, times[end]!)))
    const variance = varianceChange(residuals, stability.fit.phiMiddle)
    const alpha = lookAlpha(input, end + 1 - trendStart)
    return { residuals, stability, variance, alpha, evidence: judgeEvidence(stability, variance, alpha) }
  })
}

/**
 * Once the trend window slides, a look says slowing down only when the look before it (one
 * evaluation interval earlier) said so too: at the sliding phase's small α a single extreme look
 * is likelier than the fitted tail says, and two in a row kept the false alerts per window per
 * unit α at 3–24 per null kind against 26–62 for one (indicatorDefaults.ts FALSE_ALERTS_PER_WINDOW_PER_ALPHA).
 * While the window grows its looks are nested and α is larger, and one look suffices: waiting for
 * a second cost a third of the fold approaches on short records. The earlier window is detrended
 * on its own and seeded by its own end, so it is judged exactly as its look was; it is only
 * re-tested when the current look passes, which on data without an approach is rare.
 */
function confirmedEvidence(
  input: RecordInput, look: Look, trendStart: number, end: number, usable: number, time: StageTimer,
): TrendEvidence {
  const { settings } = input
  if (look.evidence !== 'slowing down' || trendWindowGrowing(settings, end + 1 - trendStart)) return look.evidence
  const previousEnd = end - settings.evaluateEvery
  const previousStart = Math.max(previousEnd + 1 - settings.trendWindowSamples, usable)
  const confirmed = previousEnd + 1 - previousStart >= settings.minTrendSamples
    && judgeLook(input, previousStart, previousEnd, time).evidence === 'slowing down'
  return confirmed ? look.evidence : judgeEvidence(look.stability, look.variance, look.alpha, false)
}

/**
 * α of one look. While the trend window still grows from its minimum, successive looks are nested
 * (each adds `evaluateEvery` samples to the same data) and together spend about one test's worth
 * of error; once it slides, every trend window's worth of data brings a new chance, and the look
 * spends the tag's false-alert budget per day instead (indicatorDefaults.ts slidingLookAlpha).
 */
function lookAlpha(input: RecordInput, trendSamples: number): number {
  if (trendWindowGrowing(input.settings, trendSamples)) return input.settings.alpha
  return input.slidingAlpha ?? slidingLookAlpha(input.settings, input.samplePeriodS)
}

/**
 * Kendall τ of rolling AR1 and variance over the trend window, for people reading the charts:
 * the published summary of a trend (docs/science.md §S3.4). The decision does not use them.
 */
function displayTaus(times: Float64Array, residuals: Float64Array, settings: IndicatorSettings) {
  const window = Math.min(settings.windowSamples, Math.floor(residuals.length / 2))
  const series = indicatorSeries(times, residuals, { window: { kind: 'count', samples: window }, step: settings.indicatorStep })
  if (series.time.length < 3) return { ar1: null, variance: null }
  return { ar1: finite(trendTau(series.ar1)), variance: finite(trendTau(series.variance)) }
}

function foldOf(times: Float64Array, residuals: Float64Array, now: number): EvaluationPoint['fold'] {
  const profile = foldProfile(times, residuals, { confidence: FOLD_CONFIDENCE })
  if (profile.kind !== 'fold in view') return { kind: 'none' }
  return { kind: 'projected', seconds: profile.foldTime - now, lowSeconds: profile.low - now, highSeconds: profile.high - now }
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
