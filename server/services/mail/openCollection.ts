// The one rule for mails that gather several alarms (a site's digest, its summary of alarms raised
// from old history): an alarm joins the site's pending message of that kind, which is created on
// first need in the caller's transaction. A partial unique index on (site) for pending rows of
// each kind makes the insert-or-join atomic under concurrent activations.
import { sql } from 'drizzle-orm'
import { notificationOutbox } from '../../db/schema'
import type { AlarmRow } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'

export interface CollectionJoin {
  kind: 'digest' | 'history_summary'
  emails: string[]
  /** Routes behind the addresses, for their delivery logs (none for a history summary). */
  routeIds?: number[]
  /** Seconds the message collects before it is sent. */
  collectSeconds: number
  /** Push the send time back on every join, so one message covers a back-fill still going on. */
  keepCollecting: boolean
}

/**
 * The kind as an SQL literal: ON CONFLICT infers a partial unique index only from a predicate it
 * can prove at planning time, which a bound parameter is not.
 */
const KIND_LITERAL = { digest: sql.raw(`'digest'`), history_summary: sql.raw(`'history_summary'`) } as const

export async function joinOpenCollection(tx: DbTransaction, alarm: AlarmRow, join: CollectionJoin): Promise<void> {
  const sendAt = sql`now() + make_interval(secs => ${join.collectSeconds})`
  await tx.insert(notificationOutbox).values({
    kind: join.kind, siteId: alarm.siteId, alarmIds: [alarm.id], recipients: join.emails, routeIds: join.routeIds ?? [],
    nextAttemptAt: sendAt,
  }).onConflictDoUpdate({
    target: notificationOutbox.siteId,
    targetWhere: sql`${notificationOutbox.kind} = ${KIND_LITERAL[join.kind]} and ${notificationOutbox.status} = 'pending'`,
    set: {
      alarmIds: sql`array_append(${notificationOutbox.alarmIds}, ${alarm.id}::bigint)`,
      recipients: sql`array(select distinct unnest(${notificationOutbox.recipients} || excluded.recipients) order by 1)`,
      routeIds: sql`array(select distinct unnest(${notificationOutbox.routeIds} || excluded.route_ids) order by 1)`,
      ...(join.keepCollecting ? { nextAttemptAt: sendAt } : {}),
    },
  })
}
