import { z } from 'zod'
import { dbId, textField, timeField, listLimit } from './fields'
import { ALARM_STATES, PRIORITIES } from '../alarms/vocabulary'

const id = dbId()
const comment = textField().trim().max(1000, 'must have at most 1000 characters')
const time = timeField()

export const alarmListQuerySchema = z.object({
  view: z.enum(['active', 'history'], { errorMap: () => ({ message: 'must be active or history' }) }).default('active'),
  unitId: id.optional(),
  priority: z.enum(PRIORITIES, { errorMap: () => ({ message: `must be one of ${PRIORITIES.join(', ')}` }) }).optional(),
  state: z.enum(ALARM_STATES, { errorMap: () => ({ message: `must be one of ${ALARM_STATES.join(', ')}` }) }).optional(),
  from: time.optional(),
  to: time.optional(),
  limit: listLimit(500, 100),
}).refine(q => !q.from || !q.to || q.from < q.to, { path: ['to'], message: 'must be after from' })
export type AlarmListQuery = z.infer<typeof alarmListQuerySchema>

export const acknowledgeSchema = z.object({
  ids: z.array(id, { required_error: 'is required (a list of alarm ids)', invalid_type_error: 'must be a list of alarm ids' })
    .min(1, 'must name at least one alarm').max(200, 'must name at most 200 alarms')
    .refine(ids => new Set(ids).size === ids.length, 'must not repeat an alarm'),
  comment: comment.optional(),
  /** Sent again with a retried request, so an acknowledgement that did land is not refused. */
  requestId: textField().trim().min(8, 'must have at least 8 characters').max(100).optional(),
})
export type AcknowledgeInput = z.infer<typeof acknowledgeSchema>

/** Shelving is time-limited (ISA-18.2): at most 12 hours, so nothing stays shelved past a shift. */
export const MAX_SHELVE_MINUTES = 720

export const shelveSchema = z.object({
  reason: textField().trim().min(3, 'must have at least 3 characters').max(1000),
  minutes: z.number({ required_error: 'is required', invalid_type_error: 'must be a number of minutes' })
    .int('must be whole minutes').min(1, 'must be at least 1').max(MAX_SHELVE_MINUTES, `must be at most ${MAX_SHELVE_MINUTES}`),
})

// An empty body is fine: the comment is optional.
export const unshelveSchema = z.object({ comment: comment.optional() }).default({})
