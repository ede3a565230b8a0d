import { and, asc, eq, inArray, isNull, ne, sql } from 'drizzle-orm'
import { joinsIncident } from '#shared/alarms/incidents'
import { DEFAULT_INCIDENT_WINDOW_S } from '#shared/alarms/reviewVocabulary'
import { alarmRules, alarms, incidentAlarms, incidents, siteReviewSettings, units } from '../../db/schema'
import type { Db, DbExecutor } from '../../utils/db'
import { refreshIncidentSummary } from './incidentSummary'

/** Alarms grouped per tick at most; the rest wait for the next tick (oldest first). */
const GROUPING_BATCH = 500

type Member = { raisedAt: number, endedAt: number | null }
type OpenIncident = { id: number, members: Member[] }

/** Until the condition clears the occurrence stands; a re-activation clears `clearedAt` again. */
const endedAtSql = sql<string | null>`case when ${alarms.conditionActive} then null else coalesce(${alarms.clearedAt}, ${alarms.closedAt}, ${alarms.raisedAt}) end`

/** The incident window of each site, in ms (the default where a site set none). */
export async function incidentWindows(tx: DbExecutor): Promise<Map<number, number>> {
  const rows = await tx.select({ siteId: siteReviewSettings.siteId, s: siteReviewSettings.incidentWindowS }).from(siteReviewSettings)
  return new Map(rows.map(r => [r.siteId, r.s * 1000]))
}

/** The not-closed incidents of a unit with their members' standing intervals. */
async function openIncidentsOf(tx: DbExecutor, unitId: number): Promise<OpenIncident[]> {
  const rows = await tx.select({ id: incidents.id, raisedAt: alarms.raisedAt, endedAt: endedAtSql })
    .from(incidents).innerJoin(incidentAlarms, eq(incidentAlarms.incidentId, incidents.id))
    .innerJoin(alarms, eq(alarms.id, incidentAlarms.alarmId))
    .where(and(eq(incidents.unitId, unitId), ne(incidents.state, 'closed')))
  const byId = new Map<number, OpenIncident>()
  for (const r of rows) {
    const entry = byId.get(r.id) ?? { id: r.id, members: [] }
    entry.members.push({ raisedAt: r.raisedAt.getTime(), endedAt: r.endedAt === null ? null : Date.parse(r.endedAt) })
    byId.set(r.id, entry)
  }
  return [...byId.values()]
}

/**
 * Puts every alarm not yet in an incident into one (docs/design.md, incidents): it joins the
 * newest not-closed incident of its unit it belongs with (shared/alarms/incidents joinsIncident,
 * the site's window), else starts an automatic one. One instance at a time (advisory lock), in
 * one transaction with the summaries it changes. Returns how many alarms it placed.
 */
export async function groupNewAlarms(db: Db): Promise<number> {
  return db.transaction(async (tx) => {
    const [lock] = await tx.execute<{ ok: boolean }>(sql`select pg_try_advisory_xact_lock(hashtext('brinkline incident grouping')) as ok`)
    if (!lock?.ok) return 0
    const fresh = await tx.select({
      id: alarms.id, siteId: alarms.siteId, unitId: alarms.unitId, raisedAt: alarms.raisedAt, endedAt: endedAtSql,
      unitCode: units.code, ruleName: alarmRules.name,
    })
      .from(alarms).leftJoin(incidentAlarms, eq(incidentAlarms.alarmId, alarms.id))
      .innerJoin(units, eq(units.id, alarms.unitId)).innerJoin(alarmRules, eq(alarmRules.id, alarms.ruleId))
      .where(isNull(incidentAlarms.alarmId)).orderBy(asc(alarms.raisedAt), asc(alarms.id)).limit(GROUPING_BATCH)
    if (fresh.length === 0) return 0
    const windows = await incidentWindows(tx)
    const open = new Map<number, OpenIncident[]>()
    const touched = new Set<number>()
    for (const a of fresh) {
      const windowMs = windows.get(a.siteId) ?? DEFAULT_INCIDENT_WINDOW_S * 1000
      if (!open.has(a.unitId)) open.set(a.unitId, await openIncidentsOf(tx, a.unitId))
      const candidates = open.get(a.unitId)!
      const raisedAt = a.raisedAt.getTime()
      const latestRaise = (i: OpenIncident) => Math.max(...i.members.map(m => m.raisedAt))
      const home = candidates.filter(i => joinsIncident(i.members, raisedAt, windowMs)).sort((x, y) => latestRaise(y) - latestRaise(x))[0]
      const member = { raisedAt, endedAt: a.endedAt === null ? null : Date.parse(a.endedAt) }
      let incidentId = home?.id
      if (home) home.members.push(member)
      else {
        const [created] = await tx.insert(incidents).values({ siteId: a.siteId, unitId: a.unitId, origin: 'automatic', title: `${a.unitCode}: ${a.ruleName}` }).returning({ id: incidents.id })
        incidentId = created!.id
        candidates.push({ id: incidentId, members: [member] })
      }
      await tx.insert(incidentAlarms).values({ alarmId: a.id, incidentId: incidentId! })
      touched.add(incidentId!)
    }
    for (const id of touched) await refreshIncidentSummary(tx, id)
    return fresh.length
  })
}

/** Incidents with no alarm left (after a split, a merge or a hand-opened incident took them) are removed. */
export async function dropEmptyIncidents(tx: DbExecutor, ids: number[]): Promise<number[]> {
  if (ids.length === 0) return []
  const dropped = await tx.delete(incidents).where(and(inArray(incidents.id, ids), ne(incidents.state, 'closed'),
    sql`not exists (select 1 from incident_alarms ia where ia.incident_id = ${incidents.id})`)).returning({ id: incidents.id })
  return dropped.map(d => d.id)
}
