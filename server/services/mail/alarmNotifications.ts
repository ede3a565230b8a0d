import { and, eq, gt, inArray, isNull, or, sql } from 'drizzle-orm'
import { DIGEST_COLLECT_SECONDS, FLOOD_WINDOW_MINUTES, inFlood } from '#shared/alarms/flood'
import { PRIORITIES, priorityRank, type Priority } from '#shared/alarms/vocabulary'
import { renderAlarmMail } from '#shared/notifications/alarmMail'
import { alarmEvents, alarms, notificationOutbox, notificationRoutes, users } from '../../db/schema'
import type { AlarmRow } from '../../db/schema'
import type { DbExecutor, DbTransaction } from '../../utils/db'
import { loadAlarmMailFacts } from './alarmMailFacts'

/** Addresses of the routes that want this alarm: matching site or unit, at or above their priority. */
export async function recipientsFor(db: DbExecutor, alarm: Pick<AlarmRow, 'siteId' | 'unitId' | 'priority'>): Promise<string[]> {
  const wanted = PRIORITIES.filter(p => priorityRank(p) >= priorityRank(alarm.priority as Priority))
  const routes = await db.select().from(notificationRoutes).where(and(
    eq(notificationRoutes.siteId, alarm.siteId),
    eq(notificationRoutes.enabled, true),
    or(isNull(notificationRoutes.unitId), eq(notificationRoutes.unitId, alarm.unitId)),
    inArray(notificationRoutes.minPriority, wanted),
  ))
  const roles = routes.flatMap(r => (r.role ? [r.role] : []))
  const byRole = roles.length === 0 ? [] : await db.select({ email: users.email }).from(users)
    .where(and(inArray(users.role, roles), eq(users.active, true)))
  return [...new Set([...routes.flatMap(r => (r.email ? [r.email] : [])), ...byRole.map(u => u.email)])].sort()
}

/**
 * Live annunciations on the site in the trailing flood window (this one included). Those from
 * old history are left out: they are not mailed, so they must not push live alarms into a digest.
 */
async function recentAnnunciations(db: DbExecutor, siteId: number, maxAgeMinutes: number): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(alarmEvents)
    .innerJoin(alarms, eq(alarms.id, alarmEvents.alarmId))
    .where(and(eq(alarms.siteId, siteId), eq(alarmEvents.toState, 'unacknowledged'),
      gt(alarmEvents.at, sql`now() - make_interval(mins => ${FLOOD_WINDOW_MINUTES})`),
      or(isNull(alarmEvents.conditionTime), sql`${alarmEvents.conditionTime} >= ${alarmEvents.at} - make_interval(mins => ${maxAgeMinutes})`)))
  return row!.n
}

/**
 * Writes the mail for an annunciated alarm into the outbox, in the caller's transaction, so the
 * mail exists exactly when the state change does. During a flood the alarm joins the site's open
 * digest instead (created on first need, sent after a short collection time).
 */
export async function enqueueAlarmMail(tx: DbTransaction, alarm: AlarmRow, publicUrl: string, maxAgeMinutes: number): Promise<void> {
  const recipients = await recipientsFor(tx, alarm)
  if (recipients.length === 0) return
  if (inFlood(await recentAnnunciations(tx, alarm.siteId, maxAgeMinutes))) {
    await tx.insert(notificationOutbox).values({
      kind: 'digest', siteId: alarm.siteId, alarmIds: [alarm.id], recipients,
      nextAttemptAt: sql`now() + make_interval(secs => ${DIGEST_COLLECT_SECONDS})`,
    }).onConflictDoUpdate({
      target: notificationOutbox.siteId,
      targetWhere: sql`${notificationOutbox.kind} = 'digest' and ${notificationOutbox.status} = 'pending'`,
      set: {
        alarmIds: sql`array_append(${notificationOutbox.alarmIds}, ${alarm.id}::bigint)`,
        recipients: sql`array(select distinct unnest(${notificationOutbox.recipients} || excluded.recipients) order by 1)`,
      },
    })
    return
  }
  const [facts] = await loadAlarmMailFacts(tx, [alarm.id], publicUrl)
  const mail = renderAlarmMail(facts!)
  await tx.insert(notificationOutbox).values({
    kind: 'alarm', siteId: alarm.siteId, alarmId: alarm.id, recipients, subject: mail.subject, body: mail.text,
  })
}
