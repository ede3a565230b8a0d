import { rawWindowStartMs } from '#shared/utils/rawWindow'
import type { Db } from '../../utils/db'
import { forgetSampleDay, listPartitions, type Partition } from './partitions'

export interface RetentionReport {
  /** Day partitions folded into the archive and dropped whole. */
  droppedPartitions: string[]
  /** Raw rows folded into the archive (dropped with their partition or deleted from it). */
  archivedRows: number
}

interface SiteWindow { id: number, rawRetentionDays: number }

/**
 * Each site's raw window: a day partition whose whole day is older than a site's window has that
 * site's rows folded into the per-minute archive and removed, in one transaction per partition,
 * so a run cut short leaves every reading either raw or archived, never neither nor both. A
 * partition left with no rows of a site still within its window is dropped whole (cheap); else
 * the expired sites' rows are deleted from it. Raw goes in whole days (shared/utils/rawWindow.ts),
 * and ingest refuses samples older than the window, so a re-sent batch is never archived twice.
 * A second run finds nothing to do: it is safe to repeat.
 */
export async function applyRetention(db: Db, nowMs: number): Promise<RetentionReport> {
  const sites = await db.$sql<SiteWindow[]>`
    select id, raw_retention_days as "rawRetentionDays" from sites where raw_retention_days is not null`
  const report: RetentionReport = { droppedPartitions: [], archivedRows: 0 }
  if (sites.length === 0) return report
  for (const partition of await listPartitions(db, 'samples')) {
    const expired = sites.filter(s => partition.toMs <= rawWindowStartMs(nowMs, s.rawRetentionDays)).map(s => s.id)
    if (expired.length === 0) continue
    const outcome = await expirePartition(db, partition, expired)
    report.archivedRows += outcome.archived
    if (outcome.dropped) {
      report.droppedPartitions.push(partition.name)
      forgetSampleDay(partition.fromMs)
    }
  }
  return report
}

async function expirePartition(db: Db, partition: Partition, expiredSiteIds: number[]) {
  return db.$sql.begin(async (tx) => {
    const table = tx(partition.name)
    // No insert may slip in between the fold and the removal (it would be removed unarchived).
    await tx`lock table ${table} in share row exclusive mode`
    await tx`select brinkline_ensure_partition('samples_minute', ${new Date(partition.fromMs).toISOString()}::timestamptz)`
    const sites = tx.array(expiredSiteIds)
    // The fold merges into a minute already archived (rows of a day that arrived after it was
    // first expired): min of mins, max of maxes, the mean weighted by the counts.
    const [folded] = await tx<{ n: number }[]>`
      with folded as (
        select s.tag_id, date_trunc('minute', s.time) as minute,
          min(s.value) filter (where s.quality < 2) as value_min, avg(s.value) filter (where s.quality < 2) as value_mean,
          max(s.value) filter (where s.quality < 2) as value_max,
          count(*) filter (where s.quality < 2)::int as samples, count(*) filter (where s.quality >= 2)::int as bad_samples
        from ${table} s join tags t on t.id = s.tag_id
        where t.site_id = any(${sites}::int[])
        group by 1, 2
      ), stored as (
        insert into samples_minute (tag_id, minute, value_min, value_mean, value_max, samples, bad_samples)
        select * from folded
        on conflict (tag_id, minute) do update set
          value_min = least(samples_minute.value_min, excluded.value_min),
          value_max = greatest(samples_minute.value_max, excluded.value_max),
          value_mean = case when samples_minute.samples + excluded.samples = 0 then null
            else (coalesce(samples_minute.value_mean * samples_minute.samples, 0) + coalesce(excluded.value_mean * excluded.samples, 0))
              / (samples_minute.samples + excluded.samples) end,
          samples = samples_minute.samples + excluded.samples,
          bad_samples = samples_minute.bad_samples + excluded.bad_samples
      )
      select coalesce(sum(samples + bad_samples), 0)::int as n from folded`
    const archived = folded!.n
    const [remaining] = await tx<{ kept: boolean }[]>`
      select exists (select 1 from ${table} s join tags t on t.id = s.tag_id where t.site_id <> all(${sites}::int[])) as kept`
    if (!remaining!.kept) {
      await tx`drop table ${table}`
      return { archived, dropped: true }
    }
    if (archived > 0) await tx`delete from ${table} s using tags t where t.id = s.tag_id and t.site_id = any(${sites}::int[])`
    return { archived, dropped: false }
  })
}
