// The site's one message about alarms raised from old history (docs/design.md §D4 item 5): each
// such activation joins the site's open summary (created on first need, in the transaction of
// the activation), which is rendered when sent so it says which alarms still stand by then.
import { eq, sql } from 'drizzle-orm'
import { HISTORY_SUMMARY_COLLECT_SECONDS } from '#shared/alarms/historyNotice'
import { renderHistorySummaryMail } from '#shared/notifications/historySummaryMail'
import { notificationOutbox, sites } from '../../db/schema'
import type { AlarmRow } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'
import { loadAlarmMailFacts } from '../mail/alarmMailFacts'
import { recipientsFor } from '../mail/alarmNotifications'

/** Adds one activation from old history to the site's open summary (nobody routed: nothing to do). */
export async function addToHistorySummary(tx: DbTransaction, alarm: AlarmRow): Promise<void> {
  const recipients = await recipientsFor(tx, alarm)
  if (recipients.length === 0) return
  await tx.insert(notificationOutbox).values({
    kind: 'history_summary', siteId: alarm.siteId, alarmIds: [alarm.id], recipients,
    nextAttemptAt: sql`now() + make_interval(secs => ${HISTORY_SUMMARY_COLLECT_SECONDS})`,
  }).onConflictDoUpdate({
    target: notificationOutbox.siteId,
    targetWhere: sql`${notificationOutbox.kind} = 'history_summary' and ${notificationOutbox.status} = 'pending'`,
    set: {
      alarmIds: sql`array_append(${notificationOutbox.alarmIds}, ${alarm.id}::bigint)`,
      recipients: sql`array(select distinct unnest(${notificationOutbox.recipients} || excluded.recipients) order by 1)`,
      // Keep collecting while the back-fill goes on, so one summary covers it.
      nextAttemptAt: sql`now() + make_interval(secs => ${HISTORY_SUMMARY_COLLECT_SECONDS})`,
    },
  })
}

/** The summary's text from the alarms as they are now (each once; activations counted). */
export async function renderHistorySummary(tx: DbTransaction, row: typeof notificationOutbox.$inferSelect, publicUrl: string, maxAgeMinutes: number) {
  const [site] = await tx.select({ name: sites.name }).from(sites).where(eq(sites.id, row.siteId!))
  const facts = await loadAlarmMailFacts(tx, [...new Set(row.alarmIds.map(Number))], publicUrl)
  return renderHistorySummaryMail({
    siteName: site?.name ?? `site ${row.siteId}`, alarms: facts, activations: row.alarmIds.length, maxAgeMinutes,
    listLink: `${publicUrl.replace(/\/$/, '')}/alarms`,
  })
}
