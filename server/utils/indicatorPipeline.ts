import { and, eq, isNull, sql } from 'drizzle-orm'
import { defaultIndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import { NO_DATA_PERIODS } from '#shared/pipeline/tagStatus'
import { indicatorSettings, tags } from '../db/schema'

/** Tags processed at once by one instance: overlaps database round trips with computation. */
const TAG_CONCURRENCY = 4

export interface TickReport {
  tags: number
  skipped: number
  samples: number
  evaluations: number
  shelvesExpired: number
  slowModes: number
  ms: number
  stages: Record<string, number>
}

/**
 * One tick of the live pipeline (DESIGN.md §4): every watched tag with samples newer than its
 * claim is processed in its own transaction; then expired shelves end, silent tags turn to
 * "no data", and the units' slow modes are refreshed. Safe to run on several instances at once.
 */
export async function runPipelineTick(db: Db, ctx: ChangeContext, clock = new StageClock()): Promise<TickReport> {
  const started = performance.now()
  const candidates = await clock.run('claim', async () => {
    await ensureTagRows(db)
    const rows = await db.execute<{ tag_id: number }>(sql`
      select st.tag_id from tag_analysis_state st join tags t on t.id = st.tag_id
      where t.watched and exists (select 1 from samples s where s.tag_id = st.tag_id
        and s.time > coalesce(st.last_sample_time, '-infinity'::timestamptz))
      order by st.tag_id`)
    return rows.map(r => Number(r.tag_id))
  })
  const report: TickReport = { tags: 0, skipped: 0, samples: 0, evaluations: 0, shelvesExpired: 0, slowModes: 0, ms: 0, stages: {} }
  let cursor = 0
  const worker = async () => {
    while (cursor < candidates.length) {
      const tagId = candidates[cursor++]!
      try {
        const done = await processTag(db, tagId, ctx, clock)
        if (!done) report.skipped++
        else {
          report.tags++
          report.samples += done.samples
          report.evaluations += done.evaluations
        }
      }
      catch (err) {
        // One tag's failure must not stop the others; its claim did not move, so it is retried.
        if (isDatabaseUnavailable(err)) throw err
        console.error(`[pipeline] tag ${tagId}:`, err)
      }
    }
  }
  await Promise.all(Array.from({ length: TAG_CONCURRENCY }, worker))
  report.shelvesExpired = await clock.run('shelve expiry', () => expireShelves(db, ctx))
  await clock.run('no-data sweep', () => markSilentTags(db))
  report.slowModes = await clock.run('unit slow mode', () => refreshSlowModes(db, ctx, clock))
  report.ms = Math.round(performance.now() - started)
  report.stages = clock.report()
  return report
}

/** Claim rows, default settings and a first status for tags the pipeline has not seen yet. */
async function ensureTagRows(db: Db): Promise<void> {
  await db.execute(sql`insert into tag_analysis_state (tag_id) select id from tags where watched on conflict do nothing`)
  await db.execute(sql`insert into tag_status (tag_id, status, reason) select id, 'no data', 'no samples yet' from tags where watched on conflict do nothing`)
  const missing = await db.select({ id: tags.id, samplePeriodS: tags.samplePeriodS }).from(tags)
    .leftJoin(indicatorSettings, eq(indicatorSettings.tagId, tags.id))
    .where(and(eq(tags.watched, true), isNull(indicatorSettings.tagId)))
  if (missing.length > 0) {
    await db.insert(indicatorSettings).values(missing.map(t => ({ tagId: t.id, ...defaultIndicatorSettings(t.samplePeriodS) }))).onConflictDoNothing()
  }
}

/** Tags whose samples stopped for NO_DATA_PERIODS sample periods; unacknowledged counts kept current. */
async function markSilentTags(db: Db): Promise<void> {
  await db.execute(sql`
    update tag_status ts set status = 'no data', updated_at = now(),
      reason = 'no sample for over ' || ${NO_DATA_PERIODS} || ' sample periods'
    from tags t
    where t.id = ts.tag_id and ts.status <> 'no data' and ts.latest_time is not null
      and ts.latest_time < now() - make_interval(secs => ${NO_DATA_PERIODS} * t.sample_period_s)`)
  await db.execute(sql`
    update tag_status ts set unacked_alarms = coalesce(a.n, 0)
    from (select t.id as tag_id, count(al.id)::int as n from tags t
          left join alarms al on al.tag_id = t.id and al.state in ('unacknowledged', 'rtn_unacknowledged')
          group by t.id) a
    where a.tag_id = ts.tag_id and ts.unacked_alarms <> coalesce(a.n, 0)`)
}
