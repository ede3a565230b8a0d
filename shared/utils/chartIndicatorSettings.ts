import type { DetrendSpec, WindowSpec } from '../analysis/types'
import { defaultIndicatorSettings, type IndicatorSettings } from '../pipeline/indicatorDefaults'

/** What the tag's stored indicator settings (table indicator_settings) say, when it has a row. */
export type StoredIndicatorSettings = IndicatorSettings

export interface ChartIndicatorSettings {
  window: Extract<WindowSpec, { kind: 'count' }>
  detrend: DetrendSpec
  /** Seconds one window spans at the tag's sample period. */
  windowSeconds: number
  /** The live pipeline's settings, for the judgement at the newest sample. */
  live: IndicatorSettings
}

/**
 * The charts use the tag's own settings, so they show what the live pipeline judges; a tag the
 * pipeline has not seen yet gets the pipeline's starting values (one owner: indicatorDefaults).
 * The causal local-linear trend is the live path's, so chart and live values agree.
 */
export function chartIndicatorSettings(samplePeriodS: number, stored?: StoredIndicatorSettings | null): ChartIndicatorSettings {
  const live = stored ?? defaultIndicatorSettings(samplePeriodS)
  return {
    window: { kind: 'count', samples: live.windowSamples },
    detrend: { kind: 'localLinear', bandwidth: live.detrendBandwidthS },
    windowSeconds: live.windowSamples * samplePeriodS,
    live,
  }
}
