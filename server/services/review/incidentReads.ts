import { and, asc, desc, eq, sql, type SQL } from 'drizzle-orm'
import { earlyWarningSummary } from '#shared/alarms/incidents'
import type { IncidentListQuery } from '#shared/schemas/incident'
import { alarmRules, alarms, alertOutcomes, incidentAlarms, incidents, sites, tags, units } from '../../db/schema'
import type { Db, DbExecutor } from '../../utils/db'

const memberCount = sql<number>`(select count(*)::int from incident_alarms ia where ia.incident_id = ${incidents.id})`
const firstRaised = sql<string | null>`(select min(a.raised_at) from incident_alarms ia join alarms a on a.id = ia.alarm_id where ia.incident_id = ${incidents.id})`
const lastRaised = sql<string | null>`(select max(a.activated_at) from incident_alarms ia join alarms a on a.id = ia.alarm_id where ia.incident_id = ${incidents.id})`
const iso = (t: string | null) => (t === null ? null : new Date(t).toISOString())

/** Incidents newest first, with their unit, size, span and lead time. */
export async function listIncidents(db: Db, q: IncidentListQuery) {
  const where: SQL[] = []
  if (q.state) where.push(eq(incidents.state, q.state))
  if (q.unitId) where.push(eq(incidents.unitId, q.unitId))
  if (q.alarmId) where.push(sql`${incidents.id} in (select incident_id from incident_alarms where alarm_id = ${q.alarmId})`)
  const rows = await db.select({
    id: incidents.id, title: incidents.title, state: incidents.state, origin: incidents.origin, unitId: incidents.unitId,
    unitCode: units.code, unitName: units.name, leadTimeS: incidents.leadTimeS, earlyWarningAt: incidents.earlyWarningAt,
    limitAlarmAt: incidents.limitAlarmAt, signedOffAt: incidents.signedOffAt, signedOffByName: incidents.signedOffByName,
    alarmCount: memberCount, firstRaisedAt: firstRaised, lastActivatedAt: lastRaised,
  }).from(incidents).innerJoin(units, eq(units.id, incidents.unitId))
    .where(and(...where)).orderBy(desc(firstRaised), desc(incidents.id)).limit(q.limit)
  return rows.map(r => ({ ...r, firstRaisedAt: iso(r.firstRaisedAt), lastActivatedAt: iso(r.lastActivatedAt) }))
}

/** The incident's alarms, oldest first, with their rule, target and the supervisor's verdict on alerts. */
export function incidentMembers(db: Db | DbExecutor, incidentId: number) {
  return db.select({
    alarmId: alarms.id, ruleId: alarms.ruleId, ruleName: alarmRules.name, priority: alarms.priority, alarmClass: alarms.alarmClass,
    measure: alarms.measure, comparison: alarms.comparison, threshold: alarms.threshold, state: alarms.state, tagId: alarms.tagId,
    tagCode: tags.code,
    raisedAt: alarms.raisedAt, activatedAt: alarms.activatedAt, activationCount: alarms.activationCount, clearedAt: alarms.clearedAt,
    closedAt: alarms.closedAt, outcome: alertOutcomes.outcome, outcomeNote: alertOutcomes.note,
  }).from(incidentAlarms).innerJoin(alarms, eq(alarms.id, incidentAlarms.alarmId)).innerJoin(alarmRules, eq(alarmRules.id, alarms.ruleId))
    .leftJoin(tags, eq(tags.id, alarms.tagId)).leftJoin(alertOutcomes, eq(alertOutcomes.alarmId, alarms.id))
    .where(eq(incidentAlarms.incidentId, incidentId)).orderBy(asc(alarms.raisedAt), asc(alarms.id))
}

/** One incident with its alarms and its early-warning verdict; undefined when there is none. */
export async function incidentDetail(db: Db, id: number) {
  const [incident] = await db.select({ incident: incidents, unitCode: units.code, unitName: units.name, timeZone: sites.timeZone })
    .from(incidents).innerJoin(units, eq(units.id, incidents.unitId)).innerJoin(sites, eq(sites.id, incidents.siteId))
    .where(eq(incidents.id, id))
  if (!incident) return undefined
  const members = await incidentMembers(db, id)
  const summary = earlyWarningSummary(members.map(m => ({ ...m, raisedAt: m.raisedAt.getTime() })))
  // Other not-closed incidents of the unit: what this one may be merged with.
  const mergeable = await db.select({ id: incidents.id, title: incidents.title, state: incidents.state }).from(incidents)
    .where(and(eq(incidents.unitId, incident.incident.unitId), sql`${incidents.id} <> ${id}`, sql`${incidents.state} <> 'closed'`))
    .orderBy(desc(incidents.id)).limit(50)
  return {
    ...incident.incident, unitCode: incident.unitCode, unitName: incident.unitName, timeZone: incident.timeZone,
    verdict: summary.verdict, members, mergeable,
  }
}
