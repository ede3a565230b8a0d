import { z } from 'zod'
import { textField } from './fields'
import type { SeriesRange } from './series'

// The per-tag settings of the live indicator pipeline (shared/pipeline/indicatorDefaults.ts
// IndicatorSettings), as the workbench edits them. Limits mirror the table's CHECK
// (server/db/schema/indicators.ts) and keep one evaluation affordable.
export const SETTINGS_LIMITS = {
  windowSamples: { min: 20, max: 10_000 },
  trendWindowSamples: { max: 20_000 },
  minTrendSamples: { min: 30 },
  indicatorStep: { min: 1, max: 1_000 },
  evaluateEvery: { min: 1, max: 1_000 },
  surrogates: { min: 19, max: 999 },
  alpha: { max: 0.2 },
} as const

const count = (min: number, max: number, unit = '') => z.number({ required_error: 'is required', invalid_type_error: 'must be a whole number' })
  .int('must be a whole number').min(min, `must be at least ${min}${unit}`).max(max, `must be at most ${max}${unit}`)

export const indicatorSettingsSchema = z.object({
  windowSamples: count(SETTINGS_LIMITS.windowSamples.min, SETTINGS_LIMITS.windowSamples.max, ' samples'),
  detrendBandwidthS: z.number({ required_error: 'is required', invalid_type_error: 'must be a number of seconds' }).finite()
    .positive('must be more than 0 s').max(30 * 86_400, 'must be at most 30 days'),
  trendWindowSamples: count(SETTINGS_LIMITS.minTrendSamples.min, SETTINGS_LIMITS.trendWindowSamples.max, ' samples'),
  minTrendSamples: count(SETTINGS_LIMITS.minTrendSamples.min, SETTINGS_LIMITS.trendWindowSamples.max, ' samples'),
  indicatorStep: count(SETTINGS_LIMITS.indicatorStep.min, SETTINGS_LIMITS.indicatorStep.max, ' samples'),
  evaluateEvery: count(SETTINGS_LIMITS.evaluateEvery.min, SETTINGS_LIMITS.evaluateEvery.max, ' samples'),
  surrogates: count(SETTINGS_LIMITS.surrogates.min, SETTINGS_LIMITS.surrogates.max),
  alpha: z.number({ required_error: 'is required', invalid_type_error: 'must be a number' }).finite()
    .gt(0, 'must be more than 0').max(SETTINGS_LIMITS.alpha.max, `must be at most ${SETTINGS_LIMITS.alpha.max}`),
}).strict().superRefine((s, ctx) => {
  if (s.trendWindowSamples <= s.windowSamples)
    ctx.addIssue({ code: 'custom', path: ['trendWindowSamples'], message: 'must be longer than the indicator window' })
  if (s.minTrendSamples > s.trendWindowSamples)
    ctx.addIssue({ code: 'custom', path: ['minTrendSamples'], message: 'must be at most the trend window' })
})
export type IndicatorSettingsInput = z.infer<typeof indicatorSettingsSchema>

export const indicatorSettingsSaveSchema = z.object({
  settings: indicatorSettingsSchema,
  reason: textField().trim().max(500, 'must have at most 500 characters').default(''),
}).strict()

/** A preview runs the engine twice over every raw sample in its range: a week is too long to wait for. */
export const PREVIEW_RANGES = ['1h', '6h', '24h'] as const satisfies readonly SeriesRange[]
const rangeField = z.enum(PREVIEW_RANGES, { errorMap: () => ({ message: `must be one of ${PREVIEW_RANGES.join(', ')}` }) })
export const indicatorSettingsPreviewSchema = z.object({
  settings: indicatorSettingsSchema,
  range: rangeField.default('6h'),
}).strict()
