import { and, asc, between, eq } from 'drizzle-orm'
import { INACTIVE } from '#shared/alarms/conditionTracker'
import type { EvaluationPoint } from '#shared/pipeline/evaluateRecord'
import { replayConditions, tagObservations } from '#shared/pipeline/ruleReplay'
import { entryAt } from '#shared/pipeline/settingsInForce'
import { replayOutcome, type ReplayChart, type ReplayFiring, type ReplayResult } from '#shared/pipeline/replayOutcome'
import { MAX_REPLAY_SAMPLES } from '#shared/schemas/replay'
import { bucketSamples, toJsonNumbers } from '#shared/utils/timeBuckets'
import { replays, tags, unitSlowMode, type ReplayRow } from '../../db/schema'
import type { Db } from '../../utils/db'
import { isDatabaseUnavailable, untilDatabaseAnswers } from '../../utils/dbUnavailable'
import { evaluateRecords } from '../pipeline/recordEvaluation'
import { historySamples } from '../pipeline/tagBatchLoad'

/**
 * New samples per step of a replay: what one tick of the live pipeline takes from a tag with a
 * backlog of this size, and how often the progress moves.
 */
const STEP_SAMPLES = 2_000
/** Display buckets of the value chart and most judgement points drawn. */
const CHART_BUCKETS = 1_000
const CHART_POINTS = 4_000

/** The replay cannot run as asked (too many samples); it fails with this reason. */
class ReplayRefused extends Error {}

const seconds = (d: Date) => d.getTime() / 1000
const finiteOrNull = (x: number) => (Number.isFinite(x) ? x : null)

/**
 * Runs one replay: the tag's good samples in the range, preceded by the history a tick would load,
 * go through the live engine (shared/pipeline/evaluateRecord on the server's evaluation pool) in
 * tick-sized steps and through the tag's rules as the tick feeds them (shared/pipeline/ruleReplay),
 * in time order, with the progress stored after each step. Nothing is written to the live
 * tables: the replay's alarms are only its result. A database outage is thrown, once the database
 * is back, so the queue retries the job; any other failure is stored on the replay.
 */
export async function runReplay(db: Db, id: number): Promise<void> {
  const [replay] = await db.update(replays)
    .set({ state: 'running', startedAt: new Date(), finishedAt: null, progress: 0, samplesDone: 0, result: null, error: null })
    .where(eq(replays.id, id)).returning()
  if (!replay) return
  try {
    const result = await evaluateReplay(db, replay)
    await db.update(replays).set({ state: 'done', progress: 1, result, finishedAt: new Date() }).where(eq(replays.id, id))
  }
  catch (err) {
    if (isDatabaseUnavailable(err)) {
      // The queue records the retry in the database: hand the error back only once it answers,
      // or the job would sit "active" (and the replay "running") until pg-boss's expiry, hours on.
      await untilDatabaseAnswers(() => db.$sql`select 1`)
      throw err
    }
    if (!(err instanceof ReplayRefused)) console.error(`[replay] replay ${id} failed:`, err)
    const message = err instanceof Error ? err.message : String(err)
    await db.update(replays).set({ state: 'failed', error: message, finishedAt: new Date() }).where(eq(replays.id, id))
  }
}

async function evaluateReplay(db: Db, replay: ReplayRow): Promise<ReplayResult> {
  if (replay.unitId !== null) return evaluateUnitReplay(db, replay)
  const [tag] = await db.select({ samplePeriodS: tags.samplePeriodS }).from(tags).where(eq(tags.id, replay.tagId!))
  if (!tag) throw new ReplayRefused(`tag ${replay.tagId} no longer exists`)
  const { rules } = replay
  const period = tag.samplePeriodS
  const schedule = replay.settingsInForce ?? [{ afterS: null, versionId: 0, settings: replay.settings! }]
  const history = Math.max(...schedule.map(e => historySamples(e.settings, period)))
  const loaded = replay.source === 'upload' ? await loadUploadedSamples(db, replay) : await loadReplaySamples(db, replay, history)
  const { times, values, qualities, first } = loaded
  const total = times.length - first
  await db.update(replays).set({ samplesTotal: total }).where(eq(replays.id, replay.id))
  // Evaluations fall on every evaluateEvery-th good sample the tag ever had, as in the live task.
  let counter = loaded.samplesBefore % schedule[entryAt(schedule, times[first] ?? 0)]!.settings.evaluateEvery
  let previous: EvaluationPoint | null = null
  const states = rules.map(() => ({ ...INACTIVE }))
  const measures = rules.map(r => r.measure)
  const firings: ReplayFiring[] = []
  const points: EvaluationPoint[] = []
  for (let from = first; from < times.length;) {
    // A step never spans two settings versions: each sample is evaluated with the version in force at its time.
    const entry = entryAt(schedule, times[from]!)
    const { settings } = schedule[entry]!
    const nextAfter = schedule[entry + 1]?.afterS ?? Infinity
    let to = Math.min(times.length, from + STEP_SAMPLES)
    for (let i = from + 1; i < to; i++) {
      if (times[i]! > nextAfter) {
        to = i
        break
      }
    }
    const start = Math.max(0, from - historySamples(settings, period))
    const t = times.subarray(start, to)
    const v = values.subarray(start, to)
    const q = qualities.subarray(start, to)
    const [evaluation] = await evaluateRecords([{
      tagId: replay.tagId!, times: t, values: v, firstNew: from - start, samplesSinceEvaluation: counter, samplePeriodS: period, settings,
    }])
    counter = evaluation!.samplesSinceEvaluation
    const changes = replayConditions(rules, states, tagObservations(t, v, q, from - start, evaluation!.points, measures, previous))
    for (const c of changes) firings.push({ ruleId: rules[c.rule]!.id, time: c.time, value: finiteOrNull(c.value), change: c.change })
    previous = evaluation!.points.at(-1) ?? previous
    points.push(...evaluation!.points)
    const done = to - first
    await db.update(replays).set({ samplesDone: done, progress: done / total }).where(eq(replays.id, replay.id))
    from = to
  }
  const span = spanOf(replay)
  return {
    ...replayOutcome(rules, firings, span),
    samples: total,
    evaluations: points.length,
    firings,
    chart: replayChart(times.subarray(first), values.subarray(first), points, span),
  }
}

const spanOf = (replay: ReplayRow) => ({
  from: seconds(replay.fromTime), to: seconds(replay.toTime),
  eventTime: replay.eventTime ? seconds(replay.eventTime) : null, warningWindowS: replay.warningWindowS,
})

/**
 * A unit's slow-mode rules over the fits the live task recorded in the range, in time order, as
 * the tick observes them (server/services/pipeline/slowModeRefresh.ts): a fit whose VAR(1) saw no
 * recovery at all (|μ| ≥ 1, rate null) is the slowest possible rate, 0. The chart is the rate.
 */
async function evaluateUnitReplay(db: Db, replay: ReplayRow): Promise<ReplayResult> {
  const fits = await db.select({ time: unitSlowMode.time, rate: unitSlowMode.recoveryRate }).from(unitSlowMode)
    .where(and(eq(unitSlowMode.unitId, replay.unitId!), between(unitSlowMode.time, replay.fromTime, replay.toTime)))
    .orderBy(asc(unitSlowMode.time))
  await db.update(replays).set({ samplesTotal: fits.length }).where(eq(replays.id, replay.id))
  const { rules } = replay
  const observations = fits.flatMap(f => rules.map((_, rule) => ({ rule, time: seconds(f.time), value: f.rate ?? 0, current: null })))
  const changes = replayConditions(rules, rules.map(() => ({ ...INACTIVE })), observations)
  const firings: ReplayFiring[] = changes
    .map(c => ({ ruleId: rules[c.rule]!.id, time: c.time, value: finiteOrNull(c.value), change: c.change }))
  const span = spanOf(replay)
  const time = fits.map(f => seconds(f.time))
  const rate = Float64Array.from(fits, f => f.rate ?? 0)
  // Fits come one per evaluation interval: drawn as they are unless there are more than the chart holds.
  const chart = fits.length <= CHART_BUCKETS
    ? { time, value: toJsonNumbers(rate) }
    : (b => ({ time: Array.from(b.time), value: toJsonNumbers(b.mean) }))(
        bucketSamples(Float64Array.from(time), rate, { from: span.from, to: span.to + 1e-3, count: CHART_BUCKETS }),
      )
  await db.update(replays).set({ samplesDone: fits.length, progress: 1 }).where(eq(replays.id, replay.id))
  return {
    ...replayOutcome(rules, firings, span),
    samples: fits.length,
    evaluations: fits.length,
    firings,
    chart: { ...chart, pointTime: [], ar1: [], pAr1: [] },
  }
}

/**
 * The range's good samples (bad-quality readings left out, as the live task does) after the
 * `history` newest ones before it, and how many good samples the tag had before the range.
 */
async function loadReplaySamples(db: Db, replay: ReplayRow, history: number) {
  const from = replay.fromTime.toISOString()
  const to = replay.toTime.toISOString()
  const [counted] = await db.$sql<{ before: number, inside: number }[]>`
    select (select count(*) from samples where tag_id = ${replay.tagId} and time < ${from}::timestamptz and quality < 2)::int as before,
      (select count(*) from samples where tag_id = ${replay.tagId} and time >= ${from}::timestamptz and time <= ${to}::timestamptz and quality < 2)::int as inside`
  if (counted!.inside > MAX_REPLAY_SAMPLES)
    throw new ReplayRefused(`the range holds ${counted!.inside} good samples; a replay evaluates at most ${MAX_REPLAY_SAMPLES}: choose a shorter range`)
  const rows = await db.$sql`
    (select extract(epoch from time)::float8 as t, value, quality from samples
      where tag_id = ${replay.tagId} and time < ${from}::timestamptz and quality < 2 order by time desc limit ${history})
    union all
    (select extract(epoch from time)::float8 as t, value, quality from samples
      where tag_id = ${replay.tagId} and time >= ${from}::timestamptz and time <= ${to}::timestamptz and quality < 2)
    order by t`.values()
  const times = Float64Array.from(rows, r => Number(r[0]))
  const values = Float64Array.from(rows, r => Number(r[1]))
  const qualities = Uint8Array.from(rows, r => Number(r[2]))
  const first = times.findIndex(t => t >= seconds(replay.fromTime))
  return { times, values, qualities, first: first < 0 ? times.length : first, samplesBefore: counted!.before }
}

/** A file uploaded for the replay: all of its good samples, with no history before them. */
async function loadUploadedSamples(db: Db, replay: ReplayRow) {
  const rows = await db.$sql`
    select extract(epoch from time)::float8 as t, value, quality from replay_samples
    where replay_id = ${replay.id} and quality < 2 order by time`.values()
  return {
    times: Float64Array.from(rows, r => Number(r[0])),
    values: Float64Array.from(rows, r => Number(r[1])),
    qualities: Uint8Array.from(rows, r => Number(r[2])),
    first: 0,
    samplesBefore: 0,
  }
}

function replayChart(
  times: Float64Array, values: Float64Array, points: EvaluationPoint[], span: { from: number, to: number },
): ReplayChart {
  const buckets = bucketSamples(times, values, { from: span.from, to: span.to + 1e-3, count: CHART_BUCKETS })
  const stride = Math.max(1, Math.ceil(points.length / CHART_POINTS))
  const shown = points.filter((_, i) => i % stride === 0)
  return {
    time: Array.from(buckets.time),
    value: toJsonNumbers(buckets.mean),
    pointTime: shown.map(p => p.time),
    ar1: shown.map(p => p.ar1),
    pAr1: shown.map(p => p.pAr1),
  }
}
