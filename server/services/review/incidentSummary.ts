import { eq } from 'drizzle-orm'
import { earlyWarningSummary } from '#shared/alarms/incidents'
import { alarms, incidentAlarms, incidents } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'

/** An alarm as an incident member: raised when, on which unit, standing until when. */
export async function incidentMemberFacts(tx: DbExecutor, incidentId: number) {
  return tx.select({ alarmId: alarms.id, raisedAt: alarms.raisedAt, measure: alarms.measure, alarmClass: alarms.alarmClass })
    .from(incidentAlarms).innerJoin(alarms, eq(alarms.id, incidentAlarms.alarmId)).where(eq(incidentAlarms.incidentId, incidentId))
}

/**
 * Stores the incident's early-warning summary (first slowing-down alert, first limit alarm, lead
 * between them) from its alarms now; run in the transaction that changed them.
 */
export async function refreshIncidentSummary(tx: DbExecutor, incidentId: number): Promise<void> {
  const members = await incidentMemberFacts(tx, incidentId)
  const s = earlyWarningSummary(members.map(m => ({ ...m, raisedAt: m.raisedAt.getTime() })))
  await tx.update(incidents).set({
    earlyWarningAt: s.earlyWarningAt === null ? null : new Date(s.earlyWarningAt),
    limitAlarmAt: s.limitAlarmAt === null ? null : new Date(s.limitAlarmAt),
    leadTimeS: s.leadTimeS,
    updatedAt: new Date(),
  }).where(eq(incidents.id, incidentId))
}
