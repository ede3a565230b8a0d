import { and, eq, inArray } from 'drizzle-orm'
import { splitMembers } from '#shared/alarms/incidents'
import { INCIDENT_MOVES, INCIDENT_STATE_LABELS, type IncidentState } from '#shared/alarms/reviewVocabulary'
import type { IncidentCreate, IncidentFindings } from '#shared/schemas/incident'
import { alarms, incidentAlarms, incidents, units, users } from '../../db/schema'
import type { Db, DbTransaction } from '../../utils/db'
import { writeAudit } from '../../utils/audit'
import { dropEmptyIncidents } from './incidentGrouping'
import { refreshIncidentSummary } from './incidentSummary'
import { ReviewInputError } from './reviewErrors'

/** Who acts, from where: every change below is audit-logged with it, in its own transaction. */
export interface ReviewActor { userId: number, address: string }

const FINDINGS = ['title', 'whatHappened', 'cause', 'actions', 'lessons'] as const
/** Closing signs the findings off: the incident must say at least what happened and why. */
const NEEDED_TO_CLOSE = ['whatHappened', 'cause'] as const

async function lockIncident(tx: DbTransaction, id: number, field = 'id') {
  const [row] = await tx.select().from(incidents).where(eq(incidents.id, id)).for('update')
  if (!row) throw new ReviewInputError(field, 404, `incident ${id} does not exist`)
  return row
}
function refuseClosed(row: { id: number, state: IncidentState }, field = 'state') {
  if (row.state === 'closed') throw new ReviewInputError(field, 409, `incident ${row.id} is closed: its findings and alarms stay as signed off`)
}

/**
 * Alarms that may move into an incident of `unitId`: each must exist, sit on that unit, and not
 * belong to a closed incident. Returns the incidents they leave.
 */
async function takeAlarms(tx: DbTransaction, alarmIds: number[], unitId: number): Promise<number[]> {
  const rows = await tx.select({ id: alarms.id, unitId: alarms.unitId, incidentId: incidentAlarms.incidentId, state: incidents.state })
    .from(alarms).leftJoin(incidentAlarms, eq(incidentAlarms.alarmId, alarms.id))
    .leftJoin(incidents, eq(incidents.id, incidentAlarms.incidentId))
    .where(inArray(alarms.id, alarmIds))
  const missing = alarmIds.filter(id => !rows.some(r => r.id === id))
  if (missing.length) throw new ReviewInputError('alarmIds', 404, `alarm ${missing.join(', ')} does not exist`)
  const elsewhere = rows.filter(r => r.unitId !== unitId)
  if (elsewhere.length) throw new ReviewInputError('alarmIds', 400, `alarm ${elsewhere.map(r => r.id).join(', ')} is not on unit ${unitId}`)
  const sealed = rows.filter(r => r.state === 'closed')
  if (sealed.length) throw new ReviewInputError('alarmIds', 409, `alarm ${sealed.map(r => r.id).join(', ')} belongs to a closed incident`)
  await tx.delete(incidentAlarms).where(inArray(incidentAlarms.alarmId, alarmIds))
  return [...new Set(rows.map(r => r.incidentId).filter((i): i is number => i !== null))]
}

/** Refreshes the summaries of incidents that lost alarms, and drops the ones left empty. */
async function settleSources(tx: DbTransaction, sources: number[]): Promise<number[]> {
  const dropped = await dropEmptyIncidents(tx, sources)
  for (const id of sources.filter(s => !dropped.includes(s))) await refreshIncidentSummary(tx, id)
  return dropped
}

export async function openIncident(db: Db, actor: ReviewActor, input: IncidentCreate) {
  return db.transaction(async (tx) => {
    const [unit] = await tx.select().from(units).where(eq(units.id, input.unitId))
    if (!unit) throw new ReviewInputError('unitId', 404, `unit ${input.unitId} does not exist`)
    const sources = await takeAlarms(tx, input.alarmIds, unit.id)
    const [created] = await tx.insert(incidents).values({
      siteId: unit.siteId, unitId: unit.id, origin: 'manual', createdBy: actor.userId, title: input.title ?? `${unit.code}: opened by hand`,
    }).returning({ id: incidents.id })
    const id = created!.id
    await tx.insert(incidentAlarms).values(input.alarmIds.map(alarmId => ({ alarmId, incidentId: id, addedBy: actor.userId })))
    await refreshIncidentSummary(tx, id)
    const dropped = await settleSources(tx, sources)
    await writeAudit(tx, { userId: actor.userId, action: 'incident.open', target: `incident ${id}`, address: actor.address,
      detail: { id, unitId: unit.id, alarmIds: input.alarmIds, from: sources, dropped } })
    return { id }
  })
}

export async function saveFindings(db: Db, actor: ReviewActor, id: number, input: IncidentFindings) {
  return db.transaction(async (tx) => {
    const row = await lockIncident(tx, id)
    refuseClosed(row)
    const before: Record<string, string> = {}
    const after: Record<string, string> = {}
    for (const f of FINDINGS) {
      if (input[f] === undefined || input[f] === row[f]) continue
      before[f] = row[f]
      after[f] = input[f]!
    }
    if (Object.keys(after).length === 0) return { id, changed: [] as string[] }
    await tx.update(incidents).set({ ...after, updatedAt: new Date() }).where(eq(incidents.id, id))
    await writeAudit(tx, { userId: actor.userId, action: 'incident.findings', target: `incident ${id}`, address: actor.address, detail: { id, before, after } })
    return { id, changed: Object.keys(after) }
  })
}

/** open → under review → closed (or back from review to open); closing signs off by name and time. */
export async function moveIncident(db: Db, actor: ReviewActor, id: number, to: IncidentState) {
  return db.transaction(async (tx) => {
    const row = await lockIncident(tx, id)
    if (!INCIDENT_MOVES[row.state].includes(to)) {
      const allowed = INCIDENT_MOVES[row.state].map(s => INCIDENT_STATE_LABELS[s]).join(' or ') || 'nothing (it is closed)'
      throw new ReviewInputError('state', 409, `incident ${id} is ${INCIDENT_STATE_LABELS[row.state]}; it can move to ${allowed}, not ${INCIDENT_STATE_LABELS[to]}`)
    }
    const set: Partial<typeof incidents.$inferInsert> = { state: to, updatedAt: new Date() }
    if (to === 'closed') {
      const blank = NEEDED_TO_CLOSE.filter(f => row[f].trim() === '')
      if (blank.length) throw new ReviewInputError(blank[0]!, 409, `write ${blank.join(' and ')} before closing incident ${id}`)
      const [signer] = await tx.select({ name: users.name }).from(users).where(eq(users.id, actor.userId))
      Object.assign(set, { signedOffAt: new Date(), signedOffBy: actor.userId, signedOffByName: signer!.name })
    }
    const [saved] = await tx.update(incidents).set(set).where(eq(incidents.id, id)).returning()
    await writeAudit(tx, { userId: actor.userId, action: 'incident.state', target: `incident ${id}`, address: actor.address,
      detail: { id, before: { state: row.state }, after: { state: to }, signedOffByName: saved!.signedOffByName } })
    return saved!
  })
}

/** Moves every alarm of `otherId` into `id` and removes the other incident. Same unit, neither closed. */
export async function mergeIncidents(db: Db, actor: ReviewActor, id: number, otherId: number) {
  if (id === otherId) throw new ReviewInputError('incidentId', 400, 'must name another incident than the one merged into')
  return db.transaction(async (tx) => {
    // Lock in id order so two opposite merges cannot deadlock.
    const [first, second] = id < otherId ? [id, otherId] : [otherId, id]
    const a = await lockIncident(tx, first, first === id ? 'id' : 'incidentId')
    const b = await lockIncident(tx, second, second === id ? 'id' : 'incidentId')
    const [into, other] = a.id === id ? [a, b] : [b, a]
    refuseClosed(into, 'id')
    refuseClosed(other, 'incidentId')
    if (into.unitId !== other.unitId) throw new ReviewInputError('incidentId', 400, `incident ${otherId} is on another unit than incident ${id}`)
    const moved = await tx.update(incidentAlarms).set({ incidentId: id, addedBy: actor.userId, addedAt: new Date() })
      .where(eq(incidentAlarms.incidentId, otherId)).returning({ alarmId: incidentAlarms.alarmId })
    await tx.delete(incidents).where(eq(incidents.id, otherId))
    await refreshIncidentSummary(tx, id)
    await writeAudit(tx, { userId: actor.userId, action: 'incident.merge', target: `incident ${id}`, address: actor.address,
      detail: { id, merged: otherId, mergedTitle: other.title, alarmIds: moved.map(m => m.alarmId) } })
    return { id, alarmIds: moved.map(m => m.alarmId) }
  })
}

/** Moves the named alarms of an incident into a new incident of the same unit. */
export async function splitIncident(db: Db, actor: ReviewActor, id: number, input: { alarmIds: number[], title?: string }) {
  return db.transaction(async (tx) => {
    const row = await lockIncident(tx, id)
    refuseClosed(row)
    const members = await tx.select({ alarmId: incidentAlarms.alarmId }).from(incidentAlarms).where(eq(incidentAlarms.incidentId, id))
    const split = splitMembers(members.map(m => m.alarmId), input.alarmIds)
    if (typeof split === 'string') throw new ReviewInputError('alarmIds', 400, split)
    const [created] = await tx.insert(incidents).values({
      siteId: row.siteId, unitId: row.unitId, origin: 'manual', createdBy: actor.userId, title: input.title ?? `${row.title} (split)`,
    }).returning({ id: incidents.id })
    await tx.update(incidentAlarms).set({ incidentId: created!.id, addedBy: actor.userId, addedAt: new Date() })
      .where(and(eq(incidentAlarms.incidentId, id), inArray(incidentAlarms.alarmId, split.move)))
    await refreshIncidentSummary(tx, id)
    await refreshIncidentSummary(tx, created!.id)
    await writeAudit(tx, { userId: actor.userId, action: 'incident.split', target: `incident ${id}`, address: actor.address,
      detail: { id, newId: created!.id, alarmIds: split.move } })
    return { id, newId: created!.id, kept: split.keep, moved: split.move }
  })
}
