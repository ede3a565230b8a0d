import { and, eq, isNull } from 'drizzle-orm'
import { gateways } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'
import { hashIngestKey, newIngestKey } from '../ingest/gateways'

/**
 * Gives the gateway a new key. The replaced key keeps working for `graceMinutes` so the new one
 * can be put into the gateway's configuration without losing data, then stops. A key still in
 * its grace from an earlier rotation stops at once (one previous key at most). Returns the row
 * before and after (for the audit record) and the new key, which is shown once and never stored.
 */
export async function rotateGatewayKey(tx: DbExecutor, id: number, graceMinutes: number) {
  const [before] = await tx.select().from(gateways).where(and(eq(gateways.id, id), isNull(gateways.revokedAt))).for('update')
  if (!before) return null
  const key = newIngestKey()
  const now = new Date()
  const [after] = await tx.update(gateways).set({
    keyHash: hashIngestKey(key), keyPrefix: key.slice(0, 8),
    previousKeyHash: graceMinutes > 0 ? before.keyHash : null,
    previousKeyPrefix: graceMinutes > 0 ? before.keyPrefix : null,
    previousKeyExpiresAt: graceMinutes > 0 ? new Date(now.getTime() + graceMinutes * 60_000) : null,
    keyRotatedAt: now,
  }).where(eq(gateways.id, id)).returning()
  return { before: keyFacts(before), after: keyFacts(after!), key, name: before.name }
}

/** What the audit log keeps of a gateway's keys: prefixes and times, never a digest. */
export const keyFacts = (g: typeof gateways.$inferSelect) => ({
  keyPrefix: g.keyPrefix, previousKeyPrefix: g.previousKeyPrefix, previousKeyExpiresAt: g.previousKeyExpiresAt, revokedAt: g.revokedAt,
})
