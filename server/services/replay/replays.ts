import { and, asc, desc, eq } from 'drizzle-orm'
import type { ReplayCreate } from '#shared/schemas/replay'
import type { ReplayRule } from '#shared/pipeline/replayOutcome'
import { alarmRules, replays, tags, sites } from '../../db/schema'
import type { Db, DbExecutor } from '../../utils/db'
import { findTagSettings } from '../indicatorSettings/settings'

/** The tag named by a replay does not exist. */
export class ReplayTagMissing extends Error {
  constructor(tagId: number) {
    super(`tagId: tag ${tagId} not found`)
  }
}

/**
 * Records a replay of a tag's stored history, queued: the settings it runs with (the engineer's
 * alternative, else the tag's own now) and the tag's enabled rules as they are now are copied onto it.
 */
export async function createReplay(tx: DbExecutor, input: ReplayCreate, userId: number) {
  const found = await findTagSettings(tx, input.tagId)
  if (!found) throw new ReplayTagMissing(input.tagId)
  const rules: ReplayRule[] = await tx.select({
    id: alarmRules.id, name: alarmRules.name, measure: alarmRules.measure, alarmClass: alarmRules.alarmClass, priority: alarmRules.priority,
    comparison: alarmRules.comparison, threshold: alarmRules.threshold, deadband: alarmRules.deadband,
    onDelayS: alarmRules.onDelayS, offDelayS: alarmRules.offDelayS,
  }).from(alarmRules).where(and(eq(alarmRules.tagId, input.tagId), eq(alarmRules.enabled, true))).orderBy(asc(alarmRules.id))
  const [row] = await tx.insert(replays).values({
    siteId: found.tag.siteId,
    tagId: input.tagId,
    fromTime: input.from,
    toTime: input.to,
    eventTime: input.eventTime ?? null,
    warningWindowS: input.warningWindowMinutes * 60,
    note: input.note,
    alternativeSettings: input.settings !== undefined,
    settings: input.settings ?? found.current,
    rules,
    createdBy: userId,
  }).returning()
  return row!
}

const listColumns = {
  id: replays.id, tagId: replays.tagId, tagCode: tags.code, timeZone: sites.timeZone,
  from: replays.fromTime, to: replays.toTime, eventTime: replays.eventTime, note: replays.note,
  alternativeSettings: replays.alternativeSettings, state: replays.state, progress: replays.progress,
  samplesTotal: replays.samplesTotal, samplesDone: replays.samplesDone, error: replays.error,
  createdAt: replays.createdAt, startedAt: replays.startedAt, finishedAt: replays.finishedAt,
}

/** The newest replays first, without their results. */
export async function listReplays(db: Db, limit = 100) {
  return db.select(listColumns).from(replays)
    .innerJoin(tags, eq(tags.id, replays.tagId)).innerJoin(sites, eq(sites.id, replays.siteId))
    .orderBy(desc(replays.id)).limit(limit)
}

/** One replay with its settings, rules and (once done) its result. */
export async function getReplay(db: Db, id: number) {
  const [row] = await db.select({
    ...listColumns, warningWindowS: replays.warningWindowS, settings: replays.settings, rules: replays.rules, result: replays.result,
    engineeringUnit: tags.engineeringUnit, samplePeriodS: tags.samplePeriodS,
  }).from(replays)
    .innerJoin(tags, eq(tags.id, replays.tagId)).innerJoin(sites, eq(sites.id, replays.siteId))
    .where(eq(replays.id, id))
  return row
}
