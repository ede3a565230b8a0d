import { createHash, randomBytes } from 'node:crypto'
import type { TransactionSql } from 'postgres'
import { and, asc, eq, gt, isNull, or, sql } from 'drizzle-orm'
import { gateways, sites } from '../../db/schema'
import type { Db, DbExecutor } from '../../utils/db'

export const hashIngestKey = (key: string) => createHash('sha256').update(key).digest('hex')

/** A new random ingest key: 256 bits, URL-safe, prefixed so it is recognisable in a config file. */
export const newIngestKey = () => `bk_${randomBytes(32).toString('base64url')}`

export type Gateway = typeof gateways.$inferSelect

/**
 * The gateway holding this key, unless the key is unknown or revoked. After a rotation the
 * replaced key is still accepted until its grace period ends (server/services/gateways/keyRotation.ts).
 */
export async function findGatewayByKey(db: Db, key: string): Promise<Gateway | undefined> {
  const hash = hashIngestKey(key)
  const [row] = await db.select().from(gateways)
    .where(and(isNull(gateways.revokedAt), or(
      eq(gateways.keyHash, hash),
      and(eq(gateways.previousKeyHash, hash), gt(gateways.previousKeyExpiresAt, sql`now()`)),
    )))
  return row
}

/** Creates a gateway and returns its key, which is never stored and cannot be shown again. */
export async function createGateway(db: DbExecutor, input: { siteId: number, name: string, key?: string }) {
  const key = input.key ?? newIngestKey()
  const [row] = await db.insert(gateways).values({
    siteId: input.siteId, name: input.name, keyHash: hashIngestKey(key), keyPrefix: key.slice(0, 8),
  }).returning()
  return { gateway: row!, key }
}

export async function revokeGateway(db: DbExecutor, id: number) {
  const [row] = await db.update(gateways).set({ revokedAt: new Date() })
    .where(and(eq(gateways.id, id), isNull(gateways.revokedAt))).returning()
  return row
}

export function listGateways(db: Db) {
  return db.select({
    id: gateways.id, name: gateways.name, siteId: gateways.siteId, siteName: sites.name, keyPrefix: gateways.keyPrefix,
    createdAt: gateways.createdAt, revokedAt: gateways.revokedAt, lastContactAt: gateways.lastContactAt,
    acceptedCount: gateways.acceptedCount, duplicateCount: gateways.duplicateCount, rejectedCount: gateways.rejectedCount,
    failedBatchCount: gateways.failedBatchCount, lastError: gateways.lastError,
    previousKeyPrefix: gateways.previousKeyPrefix, previousKeyExpiresAt: gateways.previousKeyExpiresAt, keyRotatedAt: gateways.keyRotatedAt,
  }).from(gateways).innerJoin(sites, eq(sites.id, gateways.siteId)).orderBy(asc(gateways.name))
}

/** Counts a refused batch against the gateway so admins can see a misconfigured source. */
export async function recordFailedBatch(db: Db, gatewayId: number, message: string) {
  await db.$sql.begin(async (tx) => {
    await tx`
      update gateways set last_contact_at = now(), failed_batch_count = failed_batch_count + 1, last_error = ${message.slice(0, 500)}
      where id = ${gatewayId}`
    await tx`
      insert into gateway_hourly (gateway_id, hour, failed_batch_count) values (${gatewayId}, date_trunc('hour', now()), 1)
      on conflict (gateway_id, hour) do update set failed_batch_count = gateway_hourly.failed_batch_count + 1`
  })
}

/** Adds one stored batch to the gateway's counters (totals and this hour's), inside the batch's own transaction. */
export async function countGatewayBatch(
  tx: TransactionSql, gatewayId: number, counts: { accepted: number, duplicates: number, rejected: number },
) {
  await tx`
    update gateways set last_contact_at = now(), accepted_count = accepted_count + ${counts.accepted},
      duplicate_count = duplicate_count + ${counts.duplicates}, rejected_count = rejected_count + ${counts.rejected}
    where id = ${gatewayId}`
  await tx`
    insert into gateway_hourly (gateway_id, hour, accepted_count, duplicate_count, rejected_count)
    values (${gatewayId}, date_trunc('hour', now()), ${counts.accepted}, ${counts.duplicates}, ${counts.rejected})
    on conflict (gateway_id, hour) do update set
      accepted_count = gateway_hourly.accepted_count + excluded.accepted_count,
      duplicate_count = gateway_hourly.duplicate_count + excluded.duplicate_count,
      rejected_count = gateway_hourly.rejected_count + excluded.rejected_count`
}
