import { and, asc, between, desc, eq, inArray, isNotNull, sql } from 'drizzle-orm'
import type { ReplayCreate } from '#shared/schemas/replay'
import type { ReplayRule } from '#shared/pipeline/replayOutcome'
import { entryAt, settingsSchedule, type SettingsInForce } from '#shared/pipeline/settingsInForce'
import { alarmRules, indicatorPoints, indicatorSettingsVersions, replays, replaySamples, tags, sites, units } from '../../db/schema'
import type { Db, DbExecutor } from '../../utils/db'
import { findTagSettings } from '../indicatorSettings/settings'
import type { ReplayFileSamples } from './replayFile'

/** A replay asked to reuse the file of one that has none. */
export class ReplayFileMissing extends Error {
  constructor(replayId: number) {
    super(`fileOf: replay ${replayId} has no uploaded file`)
  }
}

/** The tag or unit named by a replay does not exist. */
export class ReplayTagMissing extends Error {
  constructor(what: 'tag' | 'unit', id: number) {
    super(`${what}Id: ${what} ${id} not found`)
  }
}

/**
 * Records a replay of a tag's stored history, queued. The settings it runs with are copied onto it:
 * the engineer's alternative for the whole range, else the tag's own versions as they were in force
 * over it. So are the tag's enabled rules as they are now.
 */
export async function createReplay(tx: DbExecutor, input: ReplayCreate, userId: number) {
  if (input.unitId !== undefined) return createUnitReplay(tx, { ...input, unitId: input.unitId }, userId)
  const tagId = input.tagId!
  const found = await findTagSettings(tx, tagId)
  if (!found) throw new ReplayTagMissing('tag', tagId)
  const rules = await rulesToReplay(tx, { tagId })
  if (input.fileOf !== undefined) {
    const [earlier] = await tx.select({ source: replays.source }).from(replays).where(eq(replays.id, input.fileOf))
    if (earlier?.source !== 'upload') throw new ReplayFileMissing(input.fileOf)
  }
  // Versions in force belong to the tag's stored history; a file runs under one set throughout.
  const inForce = input.settings === undefined && input.fileOf === undefined ? await versionsInForce(tx, tagId) : null
  const [row] = await tx.insert(replays).values({
    siteId: found.tag.siteId,
    tagId,
    fromTime: input.from,
    toTime: input.to,
    eventTime: input.eventTime ?? null,
    warningWindowS: input.warningWindowMinutes * 60,
    note: input.note,
    alternativeSettings: input.settings !== undefined,
    settings: input.settings ?? (inForce ? inForce[entryAt(inForce, input.from.getTime() / 1000)]!.settings : found.current),
    settingsInForce: inForce,
    source: input.fileOf === undefined ? 'history' : 'upload',
    rules,
    createdBy: userId,
  }).returning()
  if (input.fileOf !== undefined) {
    await tx.insert(replaySamples).select(tx.select({
      replayId: sql<number>`${row!.id}::int`.as('replay_id'), time: replaySamples.time, value: replaySamples.value, quality: replaySamples.quality,
    }).from(replaySamples).where(and(eq(replaySamples.replayId, input.fileOf), between(replaySamples.time, input.from, input.to))))
  }
  return row!
}

/** Rows of replay_samples per INSERT: four parameters each, well inside PostgreSQL's 65,535. */
const FILE_ROWS_PER_INSERT = 5_000

/**
 * Records a replay of a historian file for a tag, with the file's readings (at least two, so the
 * range is the file's own), the tag's current settings and its enabled rules as they are now.
 * The caller's transaction holds the row, the readings and the job together.
 */
export async function createFileReplay(tx: DbExecutor, input: {
  tagId: number, eventTime?: Date, warningWindowMinutes: number, note: string, file: ReplayFileSamples
}, userId: number) {
  const found = await findTagSettings(tx, input.tagId)
  if (!found) throw new ReplayTagMissing('tag', input.tagId)
  const { timesMs, values, qualities } = input.file
  const [row] = await tx.insert(replays).values({
    siteId: found.tag.siteId,
    tagId: input.tagId,
    fromTime: new Date(timesMs[0]!),
    toTime: new Date(timesMs.at(-1)!),
    eventTime: input.eventTime ?? null,
    warningWindowS: input.warningWindowMinutes * 60,
    note: input.note,
    source: 'upload',
    settings: found.current,
    rules: await rulesToReplay(tx, { tagId: input.tagId }),
    createdBy: userId,
  }).returning()
  for (let from = 0; from < timesMs.length; from += FILE_ROWS_PER_INSERT) {
    const rows = Array.from(timesMs.subarray(from, from + FILE_ROWS_PER_INSERT), (t, i) => ({
      replayId: row!.id, time: new Date(t), value: values[from + i]!, quality: qualities[from + i]!,
    }))
    await tx.insert(replaySamples).values(rows)
  }
  return row!
}

/** The tag's settings versions and the samples each governed (null: never edited, its current settings throughout). */
async function versionsInForce(tx: DbExecutor, tagId: number): Promise<SettingsInForce[] | null> {
  const versions = await tx.select({
    id: indicatorSettingsVersions.id, settings: indicatorSettingsVersions.settings,
    lastPointS: sql<number | null>`(select extract(epoch from max(p.time))::float8 from ${indicatorPoints} p
      where p.tag_id = ${tagId} and p.settings_version_id = ${indicatorSettingsVersions.id})`,
  }).from(indicatorSettingsVersions).where(eq(indicatorSettingsVersions.tagId, tagId)).orderBy(asc(indicatorSettingsVersions.id))
  if (versions.length === 0) return null
  return settingsSchedule(versions.map(v => ({ ...v, lastPointS: v.lastPointS === null ? null : Number(v.lastPointS) })))
}

/**
 * Records a replay of a unit's slow-mode rules over the fits the live task recorded in the range
 * (unit_slow_mode): the fits depend on every tag's window, so there are no settings of its own.
 */
async function createUnitReplay(tx: DbExecutor, input: ReplayCreate & { unitId: number }, userId: number) {
  const [unit] = await tx.select({ siteId: units.siteId }).from(units).where(eq(units.id, input.unitId))
  if (!unit) throw new ReplayTagMissing('unit', input.unitId)
  const [row] = await tx.insert(replays).values({
    siteId: unit.siteId,
    unitId: input.unitId,
    fromTime: input.from,
    toTime: input.to,
    eventTime: input.eventTime ?? null,
    warningWindowS: input.warningWindowMinutes * 60,
    note: input.note,
    settings: null,
    rules: await rulesToReplay(tx, { unitId: input.unitId }),
    createdBy: userId,
  }).returning()
  return row!
}

/** The tag's (or the unit's own) enabled rules as they are now, in the order the live task evaluates them. */
export async function rulesToReplay(tx: DbExecutor, target: { tagId: number } | { unitId: number }): Promise<ReplayRule[]> {
  const whose = 'tagId' in target
    ? eq(alarmRules.tagId, target.tagId)
    : and(eq(alarmRules.unitId, target.unitId), eq(alarmRules.targetKind, 'unit'))
  return tx.select({
    id: alarmRules.id, name: alarmRules.name, measure: alarmRules.measure, alarmClass: alarmRules.alarmClass, priority: alarmRules.priority,
    comparison: alarmRules.comparison, threshold: alarmRules.threshold, deadband: alarmRules.deadband,
    onDelayS: alarmRules.onDelayS, offDelayS: alarmRules.offDelayS,
  }).from(alarmRules).where(and(whose, eq(alarmRules.enabled, true))).orderBy(asc(alarmRules.id))
}

const listColumns = {
  id: replays.id, tagId: replays.tagId, unitId: replays.unitId,
  /** The tag's code, or the unit's for a unit's replay. */
  targetCode: sql<string>`coalesce(${tags.code}, ${units.code})`, timeZone: sites.timeZone,
  from: replays.fromTime, to: replays.toTime, eventTime: replays.eventTime, note: replays.note,
  alternativeSettings: replays.alternativeSettings, source: replays.source, state: replays.state, progress: replays.progress,
  samplesTotal: replays.samplesTotal, samplesDone: replays.samplesDone, error: replays.error,
  createdAt: replays.createdAt, startedAt: replays.startedAt, finishedAt: replays.finishedAt,
}

/** The newest replays first, without their results. */
export async function listReplays(db: Db, limit = 100) {
  return db.select(listColumns).from(replays)
    .leftJoin(tags, eq(tags.id, replays.tagId)).leftJoin(units, eq(units.id, replays.unitId)).innerJoin(sites, eq(sites.id, replays.siteId))
    .orderBy(desc(replays.id)).limit(limit)
}

/** One replay with its settings, rules and (once done) its result. */
export async function getReplay(db: Db, id: number) {
  const [row] = await db.select({
    ...listColumns, warningWindowS: replays.warningWindowS, settings: replays.settings, settingsInForce: replays.settingsInForce,
    rules: replays.rules, result: replays.result,
    engineeringUnit: tags.engineeringUnit, samplePeriodS: tags.samplePeriodS,
  }).from(replays)
    .leftJoin(tags, eq(tags.id, replays.tagId)).leftJoin(units, eq(units.id, replays.unitId)).innerJoin(sites, eq(sites.id, replays.siteId))
    .where(eq(replays.id, id))
  return row
}

/** Notes the queue job that works a replay (same transaction as its creation). */
export async function recordReplayJob(tx: DbExecutor, replayId: number, jobId: string) {
  await tx.update(replays).set({ jobId }).where(eq(replays.id, replayId))
}

export const GIVEN_UP_REASON = 'the job queue gave this replay up (the database was unavailable through every retry, '
  + 'or the job was cancelled); nothing of it was kept: ask for it again'

/**
 * Marks failed the replays still queued or running whose job pg-boss has given up, so none shows
 * "running" for ever. Rows from before job ids were kept are left as they are. Answers how many.
 */
export async function failGivenUpReplays(db: Db, givenUp: (jobId: string) => Promise<boolean>): Promise<number> {
  const open = await db.select({ id: replays.id, jobId: replays.jobId }).from(replays)
    .where(and(inArray(replays.state, ['queued', 'running']), isNotNull(replays.jobId)))
  let failed = 0
  for (const r of open) {
    if (!(await givenUp(r.jobId!))) continue
    const done = await db.update(replays).set({ state: 'failed', error: GIVEN_UP_REASON, finishedAt: new Date() })
      .where(and(eq(replays.id, r.id), inArray(replays.state, ['queued', 'running']))).returning({ id: replays.id })
    failed += done.length
  }
  return failed
}
