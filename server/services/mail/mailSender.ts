import { and, asc, eq, lte, sql } from 'drizzle-orm'
import { renderDigestMail } from '#shared/notifications/alarmMail'
import { backoffDelay } from '#shared/utils/retryDelay'
import { DEFAULT_NOTIFY_MAX_AGE_MINUTES } from '#shared/alarms/historyNotice'
import { notificationOutbox, outboxAttempts, sites } from '../../db/schema'
import type { Db, DbTransaction } from '../../utils/db'
import type { MailTransport } from './mailTransport'
import { loadAlarmMailFacts } from './alarmMailFacts'
import { renderHistorySummary } from '../alarms/historySummary'

/** Attempts before a message is given up (marked failed, visible to admins): about 4 h of retries. */
export const MAX_MAIL_ATTEMPTS = 12
const RETRY = { initialMs: 5_000, maxMs: 30 * 60_000 }

/** Message-ID derived from the outbox row: a message delivered twice carries the same id. */
export function outboxMessageId(outboxId: number, publicUrl: string): string {
  const host = (() => { try { return new URL(publicUrl).hostname || 'brinkline.local' } catch { return 'brinkline.local' } })()
  return `<brinkline-outbox-${outboxId}@${host}>`
}

export interface SendReport { sent: number, failed: number, retrying: number }

/**
 * Delivers due outbox messages, one per transaction: the row is claimed FOR UPDATE SKIP LOCKED
 * (so two instances never hand over the same row at once), handed to SMTP, and marked sent with
 * its attempt recorded in that same transaction.
 *
 * Guarantee: at least once. If the process dies after the relay accepted a message but before
 * the commit, the row is still pending and is sent again after restart; both copies carry the
 * same Message-ID (outboxMessageId), so a mail system or reader can recognise the duplicate.
 * Exactly-once is not possible across SMTP without the relay's cooperation.
 */
export async function sendDueMail(
  db: Db, transport: MailTransport, options: { from: string, publicUrl: string, batch?: number, notifyMaxAgeMinutes?: number },
): Promise<SendReport> {
  const report: SendReport = { sent: 0, failed: 0, retrying: 0 }
  for (let n = 0; n < (options.batch ?? 50); n++) {
    const outcome = await db.transaction(async (tx) => {
      const [row] = await tx.select().from(notificationOutbox)
        .where(and(eq(notificationOutbox.status, 'pending'), lte(notificationOutbox.nextAttemptAt, new Date())))
        .orderBy(asc(notificationOutbox.id)).limit(1).for('update', { skipLocked: true })
      if (!row) return null
      const mail = row.kind === 'digest'
        ? await renderDigest(tx, row, options.publicUrl)
        : row.kind === 'history_summary'
          ? await renderHistorySummary(tx, row, options.publicUrl, options.notifyMaxAgeMinutes ?? DEFAULT_NOTIFY_MAX_AGE_MINUTES)
          : { subject: row.subject, text: row.body }
      const started = performance.now()
      const error = await transport.sendMail({
        from: options.from, to: row.recipients, subject: mail.subject, text: mail.text,
        messageId: outboxMessageId(row.id, options.publicUrl),
        headers: { 'X-Brinkline-Outbox': String(row.id) },
      }).then(() => null, (err: Error) => err.message || String(err))
      const attempts = row.attempts + 1
      await tx.insert(outboxAttempts)
        .values({ outboxId: row.id, ok: error === null, error, durationMs: Math.round(performance.now() - started) })
      const status = error === null ? 'sent' : attempts >= MAX_MAIL_ATTEMPTS ? 'failed' : 'pending'
      await tx.update(notificationOutbox).set({
        subject: mail.subject, body: keptBody(row.kind, mail.text, error === null), attempts, status, lastError: error,
        sentAt: error === null ? new Date() : null,
        nextAttemptAt: error === null ? row.nextAttemptAt : new Date(Date.now() + backoffDelay(attempts, RETRY, Math.random)),
      }).where(eq(notificationOutbox.id, row.id))
      return status
    })
    if (outcome === null) break
    if (outcome === 'sent') report.sent++
    else if (outcome === 'failed') report.failed++
    else report.retrying++
  }
  return report
}

// A delivered account mail holds a one-time link; the outbox does not keep a usable copy of it.
const keptBody = (kind: string, text: string, sent: boolean) =>
  kind === 'account' && sent ? text.replace(/token=[A-Za-z0-9_-]+/g, 'token=(removed after delivery)') : text

async function renderDigest(tx: DbTransaction, row: typeof notificationOutbox.$inferSelect, publicUrl: string) {
  // A digest always collects one site's alarms (only account mail has no site).
  const [site] = await tx.select({ name: sites.name }).from(sites).where(eq(sites.id, row.siteId!))
  const facts = await loadAlarmMailFacts(tx, row.alarmIds, publicUrl)
  return renderDigestMail({ siteName: site?.name ?? `site ${row.siteId}`, alarms: facts, listLink: `${publicUrl.replace(/\/$/, '')}/alarms` })
}

/** Outbox counts for health views and tests. */
export function outboxSummary(db: Db) {
  return db.select({ status: notificationOutbox.status, n: sql<number>`count(*)::int` }).from(notificationOutbox).groupBy(notificationOutbox.status)
}
