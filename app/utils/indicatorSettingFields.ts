import type { IndicatorSettings } from '#shared/pipeline/indicatorDefaults'

/** The indicator settings as the workbench's forms label and explain them (settings panel, replay form). */
export const INDICATOR_SETTING_FIELDS: { key: keyof IndicatorSettings, label: string, unit: string, help: string }[] = [
  { key: 'windowSamples', label: 'Indicator window', unit: 'samples', help: 'samples per variance / lag-1 autocorrelation estimate' },
  { key: 'detrendBandwidthS', label: 'Detrending bandwidth', unit: 's', help: 'causal local-linear trend; also the warm-up after a start or a step' },
  { key: 'trendWindowSamples', label: 'Trend window (largest)', unit: 'samples', help: 'the stability-trend test looks back this far' },
  { key: 'minTrendSamples', label: 'Samples before the first judgement', unit: 'samples', help: 'the trend window grows from here' },
  { key: 'indicatorStep', label: 'Indicator step', unit: 'samples', help: 'spacing of the rolling indicators behind the τ summary' },
  { key: 'evaluateEvery', label: 'Evaluate every', unit: 'samples', help: 'how often the live task judges the tag' },
  { key: 'surrogates', label: 'Bootstrap series', unit: '', help: 'series drawn for the stability test’s null distribution' },
  { key: 'alpha', label: 'α per look', unit: '', help: 'significance of one look (5 × α while the trend window still grows)' },
]
