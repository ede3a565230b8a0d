import { and, desc, eq, lte, sql } from 'drizzle-orm'
import { fitBumpTest } from '#shared/analysis/bumpTest'
import type { IndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import type { BumpTestCreate } from '#shared/schemas/bumpTest'
import { passiveRateSe } from '#shared/utils/passiveRate'
import { parseWallClock, wallClockToUtc } from '#shared/utils/zonedTime'
import { bumpTests, indicatorPoints, indicatorSettingsVersions, sites, tags, users } from '../../db/schema'
import { findTagSettings } from '../indicatorSettings/settings'

/** The step time in the plant's zone is refused when a clock change makes it missing or ambiguous: 400 naming the field. */
export class BumpTestRefused extends Error {}

export async function listBumpTests(db: Db, tagId: number) {
  const [tag] = await db.select({ id: tags.id, code: tags.code, timeZone: sites.timeZone }).from(tags)
    .innerJoin(sites, eq(sites.id, tags.siteId)).where(eq(tags.id, tagId))
  if (!tag) return undefined
  const rows = await db.select({ test: bumpTests, recordedByName: users.name }).from(bumpTests)
    .leftJoin(users, eq(users.id, bumpTests.recordedBy)).where(eq(bumpTests.tagId, tagId)).orderBy(desc(bumpTests.stepTime))
  return { tag, tests: rows.map(r => ({ ...r.test, recordedByName: r.recordedByName })) }
}

/** Logs a bump test; fits it at once when the samples already cover its response. */
export async function createBumpTest(tx: DbTransaction, tagId: number, input: BumpTestCreate, userId: number) {
  const found = await findTagSettings(tx, tagId)
  if (!found) return undefined
  const local = wallClockToUtc(parseWallClock(input.stepTime)!, found.timeZone)
  if (!local.ok) throw new BumpTestRefused(`stepTime: ${input.stepTime} does not exist or is ambiguous in ${found.timeZone} (a clock change); give a time outside it`)
  const [created] = await tx.insert(bumpTests).values({
    tagId, stepTime: new Date(local.utcMs), stepSize: input.stepSize, responseS: input.responseS, note: input.note, recordedBy: userId,
  }).returning()
  return (await fitStoredBumpTest(tx, created!.id, { onlyIfComplete: true }))!
}

/**
 * Fits the exponential recovery to the samples from the step to the end of its response
 * (shared/analysis/bumpTest.ts) and stores it with the passive estimate from the last indicator
 * point before the step. With `onlyIfComplete`, waits while the response is still arriving.
 */
export async function fitStoredBumpTest(tx: DbTransaction, id: number, options: { onlyIfComplete?: boolean } = {}) {
  const [test] = await tx.select().from(bumpTests).where(eq(bumpTests.id, id)).for('update')
  if (!test) return undefined
  const [tag] = await tx.select().from(tags).where(eq(tags.id, test.tagId))
  const stepS = test.stepTime.getTime() / 1000
  const endS = stepS + test.responseS
  const rows = await tx.execute<{ t: number, v: number }>(sql`
    select extract(epoch from time)::float8 as t, value as v from samples
    where tag_id = ${test.tagId} and time >= to_timestamp(${stepS}) and time <= to_timestamp(${endS}) and quality < 2 order by time`)
  const complete = rows.length > 0 && Number(rows.at(-1)!.t) >= endS - tag!.samplePeriodS
  if (options.onlyIfComplete && !complete) return test
  const fit = fitBumpTest(rows.map(r => Number(r.t)), rows.map(r => Number(r.v)), stepS)
  const passive = await passiveAt(tx, test.tagId, test.stepTime, tag!.samplePeriodS)
  const [stored] = await tx.update(bumpTests).set(fit.kind === 'fit'
    ? { fitStatus: 'fit', fitReason: complete ? null : 'fitted before the whole response had arrived', rate: fit.rate, rateSe: fit.rateSe, residualSd: fit.residualSd, initialValue: fit.initialValue, finalValue: fit.finalValue, ...passive, fittedAt: new Date() }
    : { fitStatus: 'no fit', fitReason: fit.reason, rate: null, rateSe: null, residualSd: null, initialValue: null, finalValue: null, ...passive, fittedAt: new Date() })
    .where(eq(bumpTests.id, id)).returning()
  return stored!
}

/** Recovery rate of the newest indicator point before the step, with its SE from the window that produced it. */
async function passiveAt(tx: DbTransaction, tagId: number, before: Date, samplePeriodS: number) {
  const [point] = await tx
    .select({ ar1: indicatorPoints.ar1, rate: indicatorPoints.recoveryRate, version: indicatorSettingsVersions.settings })
    .from(indicatorPoints).leftJoin(indicatorSettingsVersions, eq(indicatorSettingsVersions.id, indicatorPoints.settingsVersionId))
    .where(and(eq(indicatorPoints.tagId, tagId), lte(indicatorPoints.time, before), sql`${indicatorPoints.recoveryRate} is not null`))
    .orderBy(desc(indicatorPoints.time)).limit(1)
  if (!point) return { passiveRate: null, passiveRateSe: null }
  const window = (point.version as IndicatorSettings | null)?.windowSamples ?? (await findTagSettings(tx, tagId))!.current.windowSamples
  return { passiveRate: point.rate, passiveRateSe: point.ar1 === null ? null : passiveRateSe(point.ar1, window, samplePeriodS) }
}
