import type { ValidSample } from '#shared/utils/sampleBatch'

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
 * Stores a validated batch and the gateway's counters in one transaction: all or nothing.
 * One INSERT … SELECT FROM unnest(arrays) per batch (not a row per query); ON CONFLICT DO NOTHING
 * on the (tag_id, time) key makes a retried batch harmless. Returns how many rows were new.
 */
export async function storeSamples(db: Db, input: {
  gatewayId: number
  samples: ValidSample[]
  tagIds: Map<string, number>
  rejected: number
}): Promise<{ accepted: number, duplicates: number }> {
  const { samples } = input
  const tagIds = new Int32Array(samples.length)
  const times: string[] = new Array(samples.length)
  const values = new Float64Array(samples.length)
  const qualities = new Int16Array(samples.length)
  samples.forEach((s, i) => {
    tagIds[i] = input.tagIds.get(s.tag)!
    times[i] = new Date(s.timeMs).toISOString()
    values[i] = s.value
    qualities[i] = s.quality
  })
  return db.$sql.begin(async (tx) => {
    const inserted = samples.length === 0 ? { count: 0 } : await tx`
      insert into samples (tag_id, time, value, quality)
      select * from unnest(${arrayLiteral(tagIds)}::int4[], ${arrayLiteral(times)}::timestamptz[],
        ${arrayLiteral(values)}::float8[], ${arrayLiteral(qualities)}::int2[])
      on conflict do nothing`
    const accepted = inserted.count
    const duplicates = samples.length - accepted
    await tx`
      update gateways set last_contact_at = now(), accepted_count = accepted_count + ${accepted},
        duplicate_count = duplicate_count + ${duplicates}, rejected_count = rejected_count + ${input.rejected}
      where id = ${input.gatewayId}`
    return { accepted, duplicates }
  })
}
