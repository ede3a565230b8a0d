import type { TransactionSql } from 'postgres'
import { validateSamples, type RejectedSample } from '#shared/utils/sampleBatch'
import type { Db } from '../../utils/db'
import { insertSamples, tagIdsByCode } from './ingest'

export interface IngestCounts { accepted: number, duplicates: number, rejected: number }

/**
 * The one ingest path for live data, whatever carried it (an HTTP gateway, the OPC UA collector):
 * validates each sample on its own (unknown tag, bad time, clock skew, bad value or quality),
 * inserts the valid ones idempotently on (tag, time), and lets the caller count the batch against
 * its source inside the same transaction, so samples and counters commit together or not at all.
 */
export async function ingestBatch(db: Db, input: {
  siteId: number
  items: readonly unknown[]
  countAgainstSource: (tx: TransactionSql, counts: IngestCounts) => Promise<unknown>
  nowMs?: number
}): Promise<{ accepted: number, duplicates: number, rejected: RejectedSample[] }> {
  const codes = [...new Set(input.items.flatMap(i => (typeof (i as { tag?: unknown })?.tag === 'string' ? [((i as { tag: string }).tag).trim()] : [])))]
  const tagIds = await tagIdsByCode(db, input.siteId, codes)
  const { valid, rejected } = validateSamples(input.items, code => tagIds.has(code), { nowMs: input.nowMs ?? Date.now() })
  const counts = await db.$sql.begin(async (tx) => {
    const accepted = await insertSamples(tx, valid, tagIds)
    const counts = { accepted, duplicates: valid.length - accepted, rejected: rejected.length }
    await input.countAgainstSource(tx, counts)
    return counts
  })
  return { accepted: counts.accepted, duplicates: counts.duplicates, rejected }
}
