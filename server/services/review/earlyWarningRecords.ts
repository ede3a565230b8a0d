import { earlyWarningRecord, type RecordIncident } from '#shared/alarms/earlyWarningRecord'
import type { Period } from '#shared/alarms/health'
import type { AlertOutcome } from '#shared/alarms/reviewVocabulary'
import type { AlarmClass, TagMeasure } from '#shared/alarms/vocabulary'
import type { Db } from '../../utils/db'

/**
 * The early-warning record per unit over the incidents that began in the period (their first
 * alarm raised in it), with each unit's code and name for the page.
 */
export async function unitEarlyWarningRecords(db: Db, siteId: number, p: Period) {
  const sql = db.$sql
  const rows = await sql<{ incidentId: string, unitId: number, alarmId: string, raisedAt: string, measure: TagMeasure, alarmClass: AlarmClass, outcome: AlertOutcome | null }[]>`
    with begun as (
      select ia.incident_id from incident_alarms ia join alarms a on a.id = ia.alarm_id
      join incidents i on i.id = ia.incident_id where i.site_id = ${siteId}
      group by ia.incident_id
      having min(a.raised_at) >= ${new Date(p.from).toISOString()}::timestamptz and min(a.raised_at) < ${new Date(p.to).toISOString()}::timestamptz)
    select i.id as "incidentId", i.unit_id as "unitId", a.id as "alarmId", a.raised_at as "raisedAt", a.measure,
      a.class as "alarmClass", o.outcome
    from begun b join incidents i on i.id = b.incident_id join incident_alarms ia on ia.incident_id = i.id
    join alarms a on a.id = ia.alarm_id left join alert_outcomes o on o.alarm_id = a.id
    order by i.id, a.raised_at`
  const incidents = new Map<number, RecordIncident>()
  for (const r of rows) {
    const id = Number(r.incidentId)
    const incident = incidents.get(id) ?? { incidentId: id, unitId: r.unitId, members: [] }
    const member = {
      alarmId: Number(r.alarmId), raisedAt: Date.parse(r.raisedAt), measure: r.measure, alarmClass: r.alarmClass, outcome: r.outcome,
    }
    incident.members.push(member)
    incidents.set(id, incident)
  }
  const units = await sql<{ id: number, code: string, name: string }[]>`select id, code, name from units where site_id = ${siteId}`
  const unitOf = new Map(units.map(u => [u.id, u]))
  return earlyWarningRecord([...incidents.values()]).map(r => ({
    ...r,
    unitCode: unitOf.get(r.unitId)?.code ?? String(r.unitId),
    unitName: unitOf.get(r.unitId)?.name ?? '',
    unfollowedAlerts: r.unfollowedAlerts.map(a => ({ ...a, raisedAt: new Date(a.raisedAt).toISOString() })),
  }))
}
