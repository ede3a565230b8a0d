import { z } from 'zod'
import { dbId, textField, zonedTimeField } from './fields'
import { indicatorSettingsSchema } from './indicatorSettings'
import { csvColumnsQueryShape, refineCsvColumns } from './upload'

/** The longest range one replay covers: 92 days, the longest period the alarm-health review offers. */
export const MAX_REPLAY_DAYS = 92
/** Good samples one replay evaluates at most (a 92-day range of a 10 s tag is 795,000). */
export const MAX_REPLAY_SAMPLES = 1_000_000
/**
 * Largest historian file for one replay: a million readings in the long format (time, tag, value,
 * quality) run to about 60 bytes a row.
 */
export const MAX_REPLAY_FILE_BYTES = 128 * 1024 * 1024
/** How long before a marked event an activation counts as its warning, by default and at most. */
export const DEFAULT_WARNING_WINDOW_MINUTES = 120
export const MAX_WARNING_WINDOW_MINUTES = 30 * 24 * 60

const warningWindowMinutes = z.number({ invalid_type_error: 'must be a number of minutes' }).finite()
  .positive('must be more than 0 minutes').max(MAX_WARNING_WINDOW_MINUTES, `must be at most ${MAX_WARNING_WINDOW_MINUTES} minutes (30 days)`)

export const replayCreateSchema = z.object({
  /** The tag whose history and rules to replay — or, instead, a unit whose slow-mode rules to replay. */
  tagId: dbId('tag').optional(),
  unitId: dbId('unit').optional(),
  from: zonedTimeField(),
  to: zonedTimeField(),
  eventTime: zonedTimeField().optional(),
  warningWindowMinutes: warningWindowMinutes.default(DEFAULT_WARNING_WINDOW_MINUTES),
  /** Other indicator settings to try; left out, the tag's own are used. */
  settings: indicatorSettingsSchema.optional(),
  /** Replay the file uploaded for this earlier replay (its readings in the range), not stored history. */
  fileOf: dbId('replay').optional(),
  note: textField().trim().max(500, 'must have at most 500 characters').default(''),
}).strict().superRefine((r, ctx) => {
  if ((r.tagId === undefined) === (r.unitId === undefined))
    ctx.addIssue({ code: 'custom', path: ['tagId'], message: 'give a tag (tagId) or a unit (unitId), not both' })
  // A unit's replay runs its rules over the slow-mode fits the live task recorded: nothing to re-tune.
  if (r.unitId !== undefined && r.settings !== undefined)
    ctx.addIssue({ code: 'custom', path: ['settings'], message: 'apply to a tag\'s replay only' })
  if (r.unitId !== undefined && r.fileOf !== undefined)
    ctx.addIssue({ code: 'custom', path: ['fileOf'], message: 'applies to a tag\'s replay only' })
  if (r.to.getTime() <= r.from.getTime()) ctx.addIssue({ code: 'custom', path: ['to'], message: 'must be after from' })
  else if (r.to.getTime() - r.from.getTime() > MAX_REPLAY_DAYS * 86_400_000)
    ctx.addIssue({ code: 'custom', path: ['to'], message: `must be at most ${MAX_REPLAY_DAYS} days after from` })
  if (r.eventTime && (r.eventTime.getTime() < r.from.getTime() || r.eventTime.getTime() > r.to.getTime()))
    ctx.addIssue({ code: 'custom', path: ['eventTime'], message: 'must lie between from and to' })
})
export type ReplayCreate = z.infer<typeof replayCreateSchema>

/**
 * A replay of a historian file instead of stored history (the query; the body is the CSV itself):
 * the file's columns read as the upload page reads them, the tag whose settings and rules run on
 * it, and the event mark. The range is the file's own, from its first good sample to its last.
 */
export const replayUploadQuerySchema = z.object({
  tagId: dbId('tag'),
  ...csvColumnsQueryShape,
  eventTime: zonedTimeField().optional(),
  warningWindowMinutes: z.preprocess(v => (v === undefined || v === '' ? undefined : Number(v)), warningWindowMinutes.default(DEFAULT_WARNING_WINDOW_MINUTES)),
  note: textField().trim().max(500, 'must have at most 500 characters').default(''),
}).strict().superRefine(refineCsvColumns)
export type ReplayUploadQuery = z.infer<typeof replayUploadQuerySchema>
