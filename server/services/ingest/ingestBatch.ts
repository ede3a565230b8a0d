import type { TransactionSql } from 'postgres'
import { validateSamples, type RejectedSample } from '#shared/utils/sampleBatch'
import type { Db } from '../../utils/db'
import { insertSamples, tagIdsByCode } from './ingest'
import { ensureSamplePartitions } from '../storage/partitions'
import { siteSampleClock } from './sampleClock'

/** Conflicts (same tag and time, another reading) count as rejected: they were not stored. */
export interface IngestCounts { accepted: number, duplicates: number, rejected: number }

/**
 * The one ingest path for live data, whatever carried it (an HTTP gateway, the OPC UA collector):
 * validates each sample on its own (unknown tag, bad or implausible time, clock skew, value beyond
 * the tag's physical bound, bad quality), inserts the valid ones idempotently on (tag, time),
 * reports a sample whose (tag, time) already holds a different reading as a conflict, and lets the caller count the batch against
 * its source inside the same transaction, so samples and counters commit together or not at all.
 */
export async function ingestBatch(db: Db, input: {
  siteId: number
  items: readonly unknown[]
  countAgainstSource: (tx: TransactionSql, counts: IngestCounts) => Promise<unknown>
  nowMs?: number
}): Promise<{ accepted: number, duplicates: number, conflicts: number, rejected: RejectedSample[] }> {
  const codes = [...new Set(input.items.flatMap(i => (typeof (i as { tag?: unknown })?.tag === 'string' ? [((i as { tag: string }).tag).trim()] : [])))]
  const tagIds = await tagIdsByCode(db, input.siteId, codes)
  const { valid, rejected } = validateSamples(input.items, code => tagIds.get(code), await siteSampleClock(db, input.siteId, input.nowMs))
  await ensureSamplePartitions(db, valid.map(s => s.timeMs))
  const { accepted, conflicts } = await db.$sql.begin(async (tx) => {
    const outcome = await insertSamples(tx, valid, tagIds)
    const counts = {
      accepted: outcome.accepted,
      duplicates: valid.length - outcome.accepted - outcome.conflicts.length,
      rejected: rejected.length + outcome.conflicts.length,
    }
    await input.countAgainstSource(tx, counts)
    return outcome
  })
  const all = [...rejected, ...conflicts].sort((a, b) => a.index - b.index)
  return { accepted, duplicates: valid.length - accepted - conflicts.length, conflicts: conflicts.length, rejected: all }
}
