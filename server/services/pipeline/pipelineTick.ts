import { and, eq, isNull, sql } from 'drizzle-orm'
import { defaultIndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import { NO_DATA_PERIODS } from '#shared/utils/tileStatus'
import { indicatorSettings, tags } from '../../db/schema'
import { serverEvaluationPool } from './recordEvaluation'
import { processTagBatch, type BatchOutcome } from './tagProcessing'
import type { Db } from '../../utils/db'
import type { ChangeContext } from '../../utils/changeContext'
import { StageClock } from './stageClock'
import { expireShelves } from '../alarms/alarms'
import { refreshSlowModes } from './slowModeRefresh'
import { isDatabaseUnavailable } from '../../utils/dbUnavailable'
import { sampleClock } from '../ingest/sampleClock'
import { groupNewAlarms } from '../review/incidentGrouping'

/** Tags claimed and stored together in one transaction: round trips are per batch, not per tag. */
const TAG_BATCH_SIZE = 50
/** Batches processed at once by one instance: overlaps database round trips with computation. */
const BATCH_CONCURRENCY = 2

export interface TickReport {
  tags: number
  skipped: number
  samples: number
  evaluations: number
  shelvesExpired: number
  /** Alarms placed into incidents this tick. */
  incidentAlarms: number
  slowModes: number
  ms: number
  /** Worker threads evaluating tags; 0 when they are evaluated on the main thread. */
  evaluationThreads: number
  stages: Record<string, number>
}

/**
 * One tick of the live pipeline (docs/design.md §D4 item 3): the watched tags with samples newer than their
 * claim are processed in batches, each batch in its own transaction; then expired shelves end,
 * new alarms join their incidents, silent tags turn to "no data", and the units' slow modes are refreshed. Safe to run on several
 * instances at once.
 */
export async function runPipelineTick(db: Db, ctx: ChangeContext, clock = new StageClock()): Promise<TickReport> {
  const started = performance.now()
  const horizon = analysisHorizon()
  const candidates = await clock.run('claim', async () => {
    await ensureTagRows(db)
    await recoverClaimsAhead(db, horizon)
    const rows = await db.execute<{ tag_id: number }>(sql`
      select st.tag_id from tag_analysis_state st join tags t on t.id = st.tag_id
      where t.watched and exists (select 1 from samples s where s.tag_id = st.tag_id
        and s.time > coalesce(st.last_sample_time, '-infinity'::timestamptz) and s.time <= ${horizon.toISOString()}::timestamptz)
      order by st.tag_id`)
    return rows.map(r => Number(r.tag_id))
  })
  const report: TickReport = {
    tags: 0, skipped: 0, samples: 0, evaluations: 0, shelvesExpired: 0, incidentAlarms: 0, slowModes: 0, ms: 0,
    evaluationThreads: serverEvaluationPool().threads, stages: {},
  }
  const batches = Array.from({ length: Math.ceil(candidates.length / TAG_BATCH_SIZE) },
    (_, i) => candidates.slice(i * TAG_BATCH_SIZE, (i + 1) * TAG_BATCH_SIZE))
  const count = (tagIds: number[], done: BatchOutcome) => {
    report.tags += done.claimed
    report.skipped += tagIds.length - done.claimed
    report.samples += done.samples
    report.evaluations += done.evaluations
  }
  let cursor = 0
  const worker = async () => {
    while (cursor < batches.length) {
      const batch = batches[cursor++]!
      await processIsolated(db, batch, ctx, clock, count, horizon)
    }
  }
  await Promise.all(Array.from({ length: BATCH_CONCURRENCY }, worker))
  report.shelvesExpired = await clock.run('shelve expiry', () => expireShelves(db, ctx))
  report.incidentAlarms = await clock.run('incident grouping', () => groupNewAlarms(db))
  await clock.run('no-data sweep', () => markSilentTags(db))
  report.slowModes = await clock.run('unit slow mode', () => refreshSlowModes(db, ctx, clock))
  report.ms = Math.round(performance.now() - started)
  report.stages = clock.report()
  return report
}

/**
 * Processes a batch; when it fails, its tags are retried one by one so one tag's failure does not
 * stop the others. A failed tag's claim did not move, so the next tick retries it.
 */
async function processIsolated(
  db: Db, tagIds: number[], ctx: ChangeContext, clock: StageClock, count: (tagIds: number[], done: BatchOutcome) => void, horizon: Date,
) {
  try {
    count(tagIds, await processTagBatch(db, tagIds, ctx, clock, horizon))
  }
  catch (err) {
    if (isDatabaseUnavailable(err)) throw err
    if (tagIds.length === 1) console.error(`[pipeline] tag ${tagIds[0]}:`, err)
    else for (const tagId of tagIds) await processIsolated(db, [tagId], ctx, clock, count, horizon)
  }
}

/**
 * The newest sample time a tick reads: now plus the ingest skew allowance. Ingest refuses later
 * times, but a row stored before that check (or written straight into the table) must not move a
 * tag's claim into the future, where every later, correct sample would sort before it and the tag
 * would never be analysed again.
 */
export function analysisHorizon(nowMs = Date.now()): Date {
  const { nowMs: now, maxFutureMs } = sampleClock(nowMs)
  return new Date(now + maxFutureMs)
}

/**
 * Tags whose claim already stands beyond the horizon (a future-dated sample processed before the
 * horizon existed) restart from their newest indicator point before it: the points and status
 * past the horizon were computed from the bad sample and are dropped, and the samples after the
 * restart point are analysed again. Logged, so the recovery shows in the server log.
 */
async function recoverClaimsAhead(db: Db, horizonDate: Date): Promise<void> {
  const horizon = horizonDate.toISOString()
  const recovered = await db.execute<{ tag_id: number }>(sql`
    with ahead as (
      select st.tag_id from tag_analysis_state st where st.last_sample_time > ${horizon}::timestamptz for update skip locked),
    dropped as (
      delete from indicator_points p using ahead where p.tag_id = ahead.tag_id and p.time > ${horizon}::timestamptz)
    update tag_analysis_state st set updated_at = now(), samples_since_evaluation = 0,
      last_sample_time = restart.time, last_evaluated_time = restart.time
    from ahead cross join lateral (
      select max(p.time) as time from indicator_points p where p.tag_id = ahead.tag_id and p.time <= ${horizon}::timestamptz) restart
    where st.tag_id = ahead.tag_id
    returning st.tag_id`)
  if (recovered.length > 0) console.warn(`[pipeline] tags ${recovered.map(r => r.tag_id).join(', ')}: claim stood beyond ${horizon} (future-dated sample); restarted from the newest indicator point before it`)
}

/** Claim rows, default settings and a first status for tags the pipeline has not seen yet. */
async function ensureTagRows(db: Db): Promise<void> {
  await db.execute(sql`insert into tag_analysis_state (tag_id) select id from tags where watched on conflict do nothing`)
  await db.execute(sql`insert into tag_status (tag_id, status, reason) select id, 'no data', 'no samples yet' from tags where watched on conflict do nothing`)
  const missing = await db.select({ id: tags.id, samplePeriodS: tags.samplePeriodS }).from(tags)
    .leftJoin(indicatorSettings, eq(indicatorSettings.tagId, tags.id))
    .where(and(eq(tags.watched, true), isNull(indicatorSettings.tagId)))
  if (missing.length > 0) {
    await db.insert(indicatorSettings)
      .values(missing.map(t => ({ tagId: t.id, ...defaultIndicatorSettings(t.samplePeriodS) }))).onConflictDoNothing()
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
