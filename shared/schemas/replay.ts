import { z } from 'zod'
import { dbId, textField, zonedTimeField } from './fields'
import { indicatorSettingsSchema } from './indicatorSettings'

/** The longest range one replay covers: 92 days, the longest period the alarm-health review offers. */
export const MAX_REPLAY_DAYS = 92
/** Good samples one replay evaluates at most (a 92-day range of a 10 s tag is 795,000). */
export const MAX_REPLAY_SAMPLES = 1_000_000
/** How long before a marked event an activation counts as its warning, by default and at most. */
export const DEFAULT_WARNING_WINDOW_MINUTES = 120
export const MAX_WARNING_WINDOW_MINUTES = 30 * 24 * 60

export const replayCreateSchema = z.object({
  tagId: dbId('tag'),
  from: zonedTimeField(),
  to: zonedTimeField(),
  eventTime: zonedTimeField().optional(),
  warningWindowMinutes: z.number({ invalid_type_error: 'must be a number of minutes' }).finite()
    .positive('must be more than 0 minutes').max(MAX_WARNING_WINDOW_MINUTES, `must be at most ${MAX_WARNING_WINDOW_MINUTES} minutes (30 days)`)
    .default(DEFAULT_WARNING_WINDOW_MINUTES),
  /** Other indicator settings to try; left out, the tag's own are used. */
  settings: indicatorSettingsSchema.optional(),
  note: textField().trim().max(500, 'must have at most 500 characters').default(''),
}).strict().superRefine((r, ctx) => {
  if (r.to.getTime() <= r.from.getTime()) ctx.addIssue({ code: 'custom', path: ['to'], message: 'must be after from' })
  else if (r.to.getTime() - r.from.getTime() > MAX_REPLAY_DAYS * 86_400_000)
    ctx.addIssue({ code: 'custom', path: ['to'], message: `must be at most ${MAX_REPLAY_DAYS} days after from` })
  if (r.eventTime && (r.eventTime.getTime() < r.from.getTime() || r.eventTime.getTime() > r.to.getTime()))
    ctx.addIssue({ code: 'custom', path: ['eventTime'], message: 'must lie between from and to' })
})
export type ReplayCreate = z.infer<typeof replayCreateSchema>
