import { z } from 'zod'
import { CALENDAR_MESSAGE, dbId, isImpossibleCalendarDate, listLimit } from './fields'

// ISO 8601 with an explicit offset or Z: a zone-less time would be read in the server's zone.
const instant = z.string().trim()
  .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/, 'must be an ISO 8601 time with Z or an offset')
  .refine(s => { const y = Number(s.slice(0, 4)); return y >= 2000 && y <= 2100 && Number.isFinite(Date.parse(s)) }, 'must be a real time between 2000 and 2100')
  .refine(s => !isImpossibleCalendarDate(s), CALENDAR_MESSAGE)
  .transform(s => new Date(s))

export const auditQuerySchema = z.object({
  userId: dbId('user').optional(),
  /** Exact action, or a family such as "user." or "gateway.". */
  action: z.string().trim().max(60, 'must have at most 60 characters').regex(/^[a-z_.-]*$/, 'must be an action name such as user.update or user.').optional(),
  from: instant.optional(),
  to: instant.optional(),
  limit: listLimit(1000, 200),
}).refine(q => !q.from || !q.to || q.from < q.to, { message: 'must be after from', path: ['to'] })
export type AuditQuery = z.output<typeof auditQuerySchema>
