import { z } from 'zod'
import { dbId, textField, zonedTimeField, listLimit } from './fields'

const optionalId = dbId().optional()

/** Length of a shift, and so of the handover view (12-hour shifts [common practice]). */
export const SHIFT_HOURS = 12
// A note may be written up a little after the fact, but not backdated past the shift it belongs
// to, nor dated in the future (clocks between clients differ by a few minutes at most).
const MAX_BACKDATE_MS = SHIFT_HOURS * 3_600_000
const MAX_AHEAD_MS = 5 * 60_000

export const shiftLogCreateSchema = z.object({
  body: textField().trim()
    .min(1, 'must not be empty').max(4000, 'must have at most 4000 characters'),
  at: zonedTimeField()
    .refine(d => d.getTime() <= Date.now() + MAX_AHEAD_MS, 'must not be in the future')
    .refine(d => d.getTime() >= Date.now() - MAX_BACKDATE_MS, `must be within the last ${SHIFT_HOURS} hours`)
    .optional(),
  siteId: optionalId,
  unitId: optionalId,
  tagId: optionalId,
  alarmId: optionalId,
})
export type ShiftLogCreate = z.infer<typeof shiftLogCreateSchema>

export const shiftLogQuerySchema = z.object({
  /** recent: newest first; handover: the last shift's notes, oldest first, to read in order. */
  view: z.enum(['recent', 'handover'], { errorMap: () => ({ message: 'must be recent or handover' }) }).default('recent'),
  unitId: optionalId,
  tagId: optionalId,
  alarmId: optionalId,
  limit: listLimit(500, 100),
})
export type ShiftLogQuery = z.infer<typeof shiftLogQuerySchema>

/** A note as the API answers it, with the names of what it links to. */
export interface ShiftLogNote {
  id: number, at: string, createdAt: string, body: string, siteId: number
  authorId: number | null, authorName: string | null
  unitId: number | null, unitCode: string | null, tagId: number | null, tagCode: string | null
  alarmId: number | null, alarmRuleName: string | null
}
