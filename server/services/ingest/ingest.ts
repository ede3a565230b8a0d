import type { TransactionSql } from 'postgres'
import type { RejectedSample, TagBounds, ValidSample } from '#shared/utils/sampleBatch'
import type { Db } from '../../utils/db'
import { NO_NUL } from '#shared/schemas/fields'
import { ensureSamplePartitions } from '../storage/partitions'

// Arrays go over the wire as PostgreSQL array literals ('{1,2,3}') cast on the server side: one
// text parameter per column, independent of the driver's array-type discovery. Every element is a
// number or an ISO timestamp, so no element needs quoting.
const arrayLiteral = (items: ArrayLike<number | string>) => `{${Array.prototype.join.call(items, ',')}}`

export interface SiteTag extends TagBounds { id: number }

/**
 * Tag code → id and range for the codes a batch mentions, within one site. A code holding a NUL
 * (a UTF-16 file read as UTF-8, a corrupt frame) names no tag and would make PostgreSQL fail the
 * query, so it is left out: it comes back unknown, and its sample is refused as such.
 */
export async function tagIdsByCode(db: Db, siteId: number, allCodes: string[]): Promise<Map<string, SiteTag>> {
  const codes = allCodes.filter(c => NO_NUL.test(c))
  if (codes.length === 0) return new Map()
  const rows = await db.$sql<{ id: number, code: string, range_low: number, range_high: number }[]>`
    select id, code, range_low, range_high from tags where site_id = ${siteId} and code = any(${db.$sql.array(codes)}::text[])`
  return new Map(rows.map(r => [r.code, { id: r.id, rangeLow: r.range_low, rangeHigh: r.range_high }]))
}

/** What an insert did: rows new, and the samples whose (tag, time) already holds another reading. */
export interface InsertOutcome { accepted: number, conflicts: RejectedSample[] }

/**
 * Inserts validated samples with one INSERT … SELECT FROM unnest(arrays) (not a row per query);
 * ON CONFLICT DO NOTHING on the (tag_id, time) key makes a retried batch harmless. The caller
 * makes the batch's day partitions first (storage/partitions.ts ensureSamplePartitions). A
 * sample whose key is taken by a different value or quality (stored before, or earlier in the
 * same batch) is a conflict, not a duplicate: the stored reading is kept and the sample is reported with both
 * values, so nothing changes silently. Runs inside the caller's transaction.
 */
export async function insertSamples(
  tx: TransactionSql, batch: ValidSample[], tagIdOf: Map<string, { id: number }>,
): Promise<InsertOutcome> {
  // Repeats within the batch are settled here: the first sample of a key is the one sent.
  const firstOfKey = new Map<string, ValidSample>()
  const conflicts: RejectedSample[] = []
  const samples: ValidSample[] = []
  for (const s of batch) {
    const key = `${s.tag}\u0000${s.timeMs}`
    const first = firstOfKey.get(key)
    if (!first) {
      firstOfKey.set(key, s)
      samples.push(s)
    }
    else if (first.value !== s.value || first.quality !== s.quality) conflicts.push(conflictWith(s, first.value, first.quality))
  }
  if (samples.length === 0) return { accepted: 0, conflicts }
  const tagIds = new Int32Array(samples.length)
  const times: string[] = new Array(samples.length)
  const values = new Float64Array(samples.length)
  const qualities = new Int16Array(samples.length)
  samples.forEach((s, i) => {
    tagIds[i] = tagIdOf.get(s.tag)!.id
    times[i] = new Date(s.timeMs).toISOString()
    values[i] = s.value
    qualities[i] = s.quality
  })
  const columns = [arrayLiteral(tagIds), arrayLiteral(times), arrayLiteral(values), arrayLiteral(qualities)] as const
  const inserted = await tx`
    insert into samples (tag_id, time, value, quality)
    select * from unnest(${columns[0]}::int4[], ${columns[1]}::timestamptz[], ${columns[2]}::float8[], ${columns[3]}::int2[])
    on conflict do nothing`
  if (inserted.count === samples.length) return { accepted: inserted.count, conflicts }
  // Some keys were taken. Each key of the batch now holds either this batch's sample or the
  // reading stored before it: those that differ are the conflicts (a probe per sample, only
  // for batches that met a taken key, so a first import pays nothing).
  const stored = await tx<{ n: number, value: number, quality: number }[]>`
    select i.n::int, s.value, s.quality
    from unnest(${columns[0]}::int4[], ${columns[1]}::timestamptz[], ${columns[2]}::float8[], ${columns[3]}::int2[])
      with ordinality as i(tag_id, time, value, quality, n)
    join samples s on s.tag_id = i.tag_id and s.time = i.time
    where s.value <> i.value or s.quality <> i.quality`
  for (const r of stored) conflicts.push(conflictWith(samples[r.n - 1]!, r.value, r.quality))
  return { accepted: inserted.count, conflicts }
}

function conflictWith(sample: ValidSample, storedValue: number, storedQuality: number): RejectedSample {
  return {
    index: sample.index, field: 'value',
    reason: `conflicts with the reading already stored for ${sample.tag} at ${new Date(sample.timeMs).toISOString()} `
      + `(value ${storedValue}, quality ${storedQuality}; this one ${sample.value}, quality ${sample.quality}): the stored reading is kept`,
  }
}

/**
 * Stores one batch of an uploaded file in its own transaction. A file of a million rows is many
 * batches, not one transaction; a re-run after a failure is safe because the insert is idempotent.
 */
export async function storeUploadedSamples(db: Db, samples: ValidSample[], tagIds: Map<string, { id: number }>) {
  await ensureSamplePartitions(db, samples.map(s => s.timeMs))
  const { accepted, conflicts } = await db.$sql.begin(tx => insertSamples(tx, samples, tagIds))
  return { accepted, duplicates: samples.length - accepted - conflicts.length, conflicts }
}
