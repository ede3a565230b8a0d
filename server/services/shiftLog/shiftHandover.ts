import { SHIFT_HOURS } from '#shared/schemas/shiftLog'
import type { Db } from '../../utils/db'
import { listAlarms } from '../alarms/alarms'
import { listIncidents } from '../review/incidentReads'
import { listShiftLogNotes } from './shiftLog'

const SHIFT_MS = SHIFT_HOURS * 3_600_000

/**
 * What the next shift takes over, on one page: the last shift's notes in order, the alarms still
 * standing (those raised in the last shift marked), shelved alarms whose shelve ends during the
 * next shift, and the incidents not yet closed.
 */
export async function shiftHandover(db: Db, nowMs = Date.now()) {
  const [notes, standing, incidents] = await Promise.all([
    listShiftLogNotes(db, { view: 'handover', limit: 500 }, nowMs),
    listAlarms(db, { view: 'active', limit: 500 }),
    listIncidents(db, { limit: 500 }),
  ])
  const shiftStart = nowMs - SHIFT_MS
  const nextShiftEnd = nowMs + SHIFT_MS
  const alarms = standing.filter(a => a.state !== 'shelved').map(a => ({ ...a, raisedThisShift: a.activatedAt.getTime() >= shiftStart }))
  const shelvedEnding = standing.filter(a => a.state === 'shelved' && a.shelvedUntil && a.shelvedUntil.getTime() <= nextShiftEnd)
  return {
    shift: {
      from: new Date(shiftStart).toISOString(), to: new Date(nowMs).toISOString(), nextEnds: new Date(nextShiftEnd).toISOString(),
      hours: SHIFT_HOURS,
    },
    notes,
    alarms,
    shelvedEnding,
    openIncidents: incidents.filter(i => i.state !== 'closed'),
  }
}
