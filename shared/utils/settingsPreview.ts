// The indicator-settings preview: the same recent history run through the tag-detail chart
// builder (shared/utils/tagSeries) and the live evaluation (shared/pipeline/evaluateRecord) twice,
// once with the tag's current settings and once with the proposed ones, so an engineer sees on
// the same charts what a change would do before saving it.
import { evaluateRecord } from '../pipeline/evaluateRecord'
import type { IndicatorSettings } from '../pipeline/indicatorDefaults'
import { chartIndicatorSettings } from './chartIndicatorSettings'
import { buildTagSeries, type FoldView } from './tagSeries'
import type { BucketGrid } from './timeBuckets'

/**
 * Looks of the early-warning judgement across the range. A look's verdict depends on the data
 * and the window settings, not on how often the live task looks (evaluateEvery), so the preview
 * looks at evenly spaced samples, the same ones for both settings, to stay within a few seconds.
 */
export const PREVIEW_LOOKS = 30

export interface PreviewSide {
  variance: (number | null)[]
  ar1: (number | null)[]
  recoveryRate: (number | null)[]
  /** Stability-trend p and verdict at each look (null before the first judgement). */
  p: (number | null)[]
  evidence: (string | null)[]
  /** Looks judged 'slowing down', of those that reached a judgement. */
  slowingDown: number
  judged: number
  fold: FoldView
}

export interface SettingsPreview {
  /** Display buckets (epoch s) of the indicator charts. */
  time: number[]
  value: (number | null)[]
  /** Epoch s of the judgement looks. */
  lookTime: number[]
  current: PreviewSide
  proposed: PreviewSide
}

export interface SettingsPreviewInput {
  /** Time-sorted good samples, starting early enough for the longer of the two settings' windows. */
  times: Float64Array
  values: Float64Array
  grid: BucketGrid
  samplePeriodS: number
  /** The tag id, which seeds the live bootstrap. */
  seed: number
  current: IndicatorSettings
  proposed: IndicatorSettings
}

/** Seconds of history before the range that both settings need for a judgement at its start. */
export function previewLeadSeconds(samplePeriodS: number, ...settings: IndicatorSettings[]): number {
  return Math.max(...settings.map(s => s.trendWindowSamples * samplePeriodS + 5 * s.detrendBandwidthS))
}

export function buildSettingsPreview(input: SettingsPreviewInput): SettingsPreview {
  const firstInRange = input.times.findIndex(t => t >= input.grid.from)
  const first = firstInRange < 0 ? input.times.length : firstInRange
  const inRange = input.times.length - first
  const stride = Math.max(1, Math.ceil(inRange / PREVIEW_LOOKS))
  const current = side(input, input.current, first, stride)
  const proposed = side(input, input.proposed, first, stride)
  return { time: current.time, value: current.value, lookTime: current.lookTime, current: current.view, proposed: proposed.view }
}

function side(input: SettingsPreviewInput, settings: IndicatorSettings, first: number, stride: number) {
  const { times, values, grid } = input
  const series = buildTagSeries({ times, values, grid, settings: chartIndicatorSettings(input.samplePeriodS, settings), seed: input.seed })
  // The chart builder appends the fold projection's times after the grid; the preview keeps the grid.
  const cut = <T>(column: T[]) => column.slice(0, grid.count)
  const { points } = first < times.length
    ? evaluateRecord({
        tagId: input.seed, times, values, firstNew: first, samplesSinceEvaluation: stride - 1,
        samplePeriodS: input.samplePeriodS, settings: { ...settings, evaluateEvery: stride },
      })
    : { points: [] }
  const judged = points.filter(p => p.evidence !== null)
  return {
    time: cut(series.time),
    value: cut(series.value),
    lookTime: points.map(p => p.time),
    view: {
      variance: cut(series.variance),
      ar1: cut(series.ar1),
      recoveryRate: cut(series.recoveryRate),
      p: points.map(p => p.pAr1),
      evidence: points.map(p => p.evidence),
      slowingDown: judged.filter(p => p.evidence === 'slowing down').length,
      judged: judged.length,
      fold: series.fold,
    } satisfies PreviewSide,
  }
}
