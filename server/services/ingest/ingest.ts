import type { TransactionSql } from 'postgres'
import type { ValidSample } from '#shared/utils/sampleBatch'
import type { Db } from '../../utils/db'

// Arrays go over the wire as PostgreSQL array literals ('{1,2,3}') cast on the server side: one
// text parameter per column, independent of the driver's array-type discovery. Every element is a
// number or an ISO timestamp, so no element needs quoting.
const arrayLiteral = (items: ArrayLike<number | string>) => `{${Array.prototype.join.call(items, ',')}}`

/** Tag code → id for the codes a batch mentions, within one site. */
export async function tagIdsByCode(db: Db, siteId: number, codes: string[]): Promise<Map<string, number>> {
  const rows = await db.$sql<{ id: number, code: string }[]>`
    select id, code from tags where site_id = ${siteId} and code = any(${db.$sql.array(codes)}::text[])`
  return new Map(rows.map(r => [r.code, r.id]))
}

/**
 * Inserts validated samples with one INSERT … SELECT FROM unnest(arrays) (not a row per query);
 * ON CONFLICT DO NOTHING on the (tag_id, time) key makes a retried batch harmless. Returns how
 * many rows were new. Runs inside the caller's transaction.
 */
export async function insertSamples(tx: TransactionSql, samples: ValidSample[], tagIdOf: Map<string, number>): Promise<number> {
  if (samples.length === 0) return 0
  const tagIds = new Int32Array(samples.length)
  const times: string[] = new Array(samples.length)
  const values = new Float64Array(samples.length)
  const qualities = new Int16Array(samples.length)
  samples.forEach((s, i) => {
    tagIds[i] = tagIdOf.get(s.tag)!
    times[i] = new Date(s.timeMs).toISOString()
    values[i] = s.value
    qualities[i] = s.quality
  })
  const inserted = await tx`
    insert into samples (tag_id, time, value, quality)
    select * from unnest(${arrayLiteral(tagIds)}::int4[], ${arrayLiteral(times)}::timestamptz[],
      ${arrayLiteral(values)}::float8[], ${arrayLiteral(qualities)}::int2[])
    on conflict do nothing`
  return inserted.count
}

/**
 * Stores one batch of an uploaded file in its own transaction. A file of a million rows is many
 * batches, not one transaction; a re-run after a failure is safe because the insert is idempotent.
 */
export async function storeUploadedSamples(db: Db, samples: ValidSample[], tagIds: Map<string, number>) {
  const accepted = await db.$sql.begin(tx => insertSamples(tx, samples, tagIds))
  return { accepted, duplicates: samples.length - accepted }
}
