import { alarmSystemHealth, type HealthAlarm, type HealthEvent, type Period } from '#shared/alarms/health'
import { healthFigures } from '#shared/alarms/healthFigures'
import type { Db } from '../../utils/db'
import { reviewSite } from './reviewSite'
import { unitEarlyWarningRecords } from './earlyWarningRecords'

/**
 * Alarm occurrences of the site that stood at some time in the period, with their event trails.
 * An event is placed at its process time where known (the sample that completed the condition),
 * as the standards count annunciations when they happen, not when the pipeline noticed them.
 * (Times arrive as text: the Drizzle client leaves PostgreSQL timestamps unparsed.)
 */
export async function loadHealthAlarms(db: Db, siteId: number, p: Period): Promise<HealthAlarm[]> {
  const sql = db.$sql
  const from = new Date(p.from).toISOString()
  const to = new Date(p.to).toISOString()
  const rows = await sql<{ id: string, ruleId: number, ruleName: string, priority: HealthAlarm['priority'], alarmClass: HealthAlarm['alarmClass'], raisedAt: string, closedAt: string | null }[]>`
    select a.id, a.rule_id as "ruleId", r.name as "ruleName", a.priority, a.class as "alarmClass",
      a.raised_at as "raisedAt", a.closed_at as "closedAt"
    from alarms a join alarm_rules r on r.id = a.rule_id
    where a.site_id = ${siteId} and a.raised_at < ${to}::timestamptz and (a.closed_at is null or a.closed_at >= ${from}::timestamptz)`
  if (rows.length === 0) return []
  const events = await sql<{ alarmId: string, at: string, event: string, fromState: HealthEvent['fromState'], toState: HealthEvent['toState'] }[]>`
    select alarm_id as "alarmId", coalesce(condition_time, at) as at, event, from_state as "fromState", to_state as "toState"
    from alarm_events where alarm_id = any(${sql.array(rows.map(r => r.id))}::bigint[]) order by alarm_id, id`
  const byAlarm = new Map<number, HealthEvent[]>()
  for (const e of events) {
    const list = byAlarm.get(Number(e.alarmId)) ?? []
    list.push({ at: Date.parse(e.at), event: e.event, fromState: e.fromState, toState: e.toState })
    byAlarm.set(Number(e.alarmId), list)
  }
  return rows.map(r => ({
    id: Number(r.id), ruleId: r.ruleId, ruleName: r.ruleName, priority: r.priority, alarmClass: r.alarmClass,
    raisedAt: Date.parse(r.raisedAt), closedAt: r.closedAt === null ? null : Date.parse(r.closedAt),
    events: byAlarm.get(Number(r.id)) ?? [],
  }))
}

/** The health report of one site over [from, to): figures with their targets, and the early-warning record. */
export async function alarmHealthReport(db: Db, query: { siteId?: number, from: Date, to: Date }) {
  const site = await reviewSite(db, query.siteId)
  const period = { from: query.from.getTime(), to: query.to.getTime() }
  const report = alarmSystemHealth(await loadHealthAlarms(db, site.id, period), period)
  return {
    site,
    period: { from: query.from.toISOString(), to: query.to.toISOString() },
    figures: healthFigures(report),
    report,
    earlyWarning: await unitEarlyWarningRecords(db, site.id, period),
  }
}
