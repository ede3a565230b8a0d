// The site's one message about alarms raised from old history (docs/design.md §D4 item 5): each
// such activation joins the site's open summary (created on first need, in the transaction of
// the activation), which is rendered when sent so it says which alarms still stand by then.
import { eq } from 'drizzle-orm'
import { HISTORY_SUMMARY_COLLECT_SECONDS } from '#shared/alarms/historyNotice'
import { renderHistorySummaryMail } from '#shared/notifications/historySummaryMail'
import { sites } from '../../db/schema'
import type { AlarmRow , notificationOutbox} from '../../db/schema'
import type { DbTransaction } from '../../utils/db'
import { loadAlarmMailFacts } from '../mail/alarmMailFacts'
import { recipientsFor } from '../mail/alarmNotifications'
import { joinOpenCollection } from '../mail/openCollection'

/** Adds one activation from old history to the site's open summary (nobody routed: nothing to do). */
export async function addToHistorySummary(tx: DbTransaction, alarm: AlarmRow): Promise<void> {
  const recipients = await recipientsFor(tx, alarm)
  if (recipients.length === 0) return
  await joinOpenCollection(tx, alarm, {
    kind: 'history_summary', emails: recipients, collectSeconds: HISTORY_SUMMARY_COLLECT_SECONDS, keepCollecting: true,
  })
}

/** The summary's text from the alarms as they are now (each once; activations counted). */
export async function renderHistorySummary(
  tx: DbTransaction, row: typeof notificationOutbox.$inferSelect, publicUrl: string, maxAgeMinutes: number,
) {
  const [site] = await tx.select({ name: sites.name }).from(sites).where(eq(sites.id, row.siteId!))
  const facts = await loadAlarmMailFacts(tx, [...new Set(row.alarmIds.map(Number))], publicUrl)
  return renderHistorySummaryMail({
    siteName: site?.name ?? `site ${row.siteId}`, alarms: facts, activations: row.alarmIds.length, maxAgeMinutes,
    listLink: `${publicUrl.replace(/\/$/, '')}/alarms`,
  })
}
