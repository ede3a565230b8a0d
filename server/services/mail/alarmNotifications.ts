import { and, eq, gt, isNull, or, sql } from 'drizzle-orm'
import { DIGEST_COLLECT_SECONDS, FLOOD_WINDOW_MINUTES, inFlood } from '#shared/alarms/flood'
import { renderAlarmMail } from '#shared/notifications/alarmMail'
import { alarmEvents, alarms, notificationOutbox } from '../../db/schema'
import type { AlarmRow } from '../../db/schema'
import type { DbExecutor, DbTransaction } from '../../utils/db'
import { alarmRecipients, type Recipients } from '../notifications/alarmRecipients'
import { loadAlarmMailFacts } from './alarmMailFacts'
import { joinOpenCollection } from './openCollection'

/** Every address routed to this alarm now, whatever the delivery preference (history summaries). */
export async function recipientsFor(db: DbExecutor, alarm: AlarmRow): Promise<string[]> {
  const { immediate, digest } = await alarmRecipients(db, alarm)
  return [...new Set([...immediate.emails, ...digest.emails])].sort()
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
 * mail exists exactly when the state change does. Routes that prefer a digest, and during a flood
 * every route, get the alarm in the site's open digest instead (created on first need, sent after
 * a short collection time). Each outbox row lists the routes behind it for their delivery logs.
 */
export async function enqueueAlarmMail(tx: DbTransaction, alarm: AlarmRow, publicUrl: string, maxAgeMinutes: number): Promise<void> {
  const { immediate, digest } = await alarmRecipients(tx, alarm)
  if (immediate.emails.length === 0 && digest.emails.length === 0) return
  const flood = immediate.emails.length > 0 && inFlood(await recentAnnunciations(tx, alarm.siteId, maxAgeMinutes))
  const toDigest: Recipients = flood
    ? { emails: [...new Set([...immediate.emails, ...digest.emails])].sort(), routeIds: [...immediate.routeIds, ...digest.routeIds] }
    : digest
  if (toDigest.emails.length > 0) {
    await joinOpenCollection(tx, alarm, {
      kind: 'digest', emails: toDigest.emails, routeIds: toDigest.routeIds, collectSeconds: DIGEST_COLLECT_SECONDS, keepCollecting: false,
    })
  }
  if (flood || immediate.emails.length === 0) return
  const [facts] = await loadAlarmMailFacts(tx, [alarm.id], publicUrl)
  const mail = renderAlarmMail(facts!)
  await tx.insert(notificationOutbox).values({
    kind: 'alarm', siteId: alarm.siteId, alarmId: alarm.id, recipients: immediate.emails, routeIds: immediate.routeIds,
    subject: mail.subject, body: mail.text,
  })
}
