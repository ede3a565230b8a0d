import { and, eq, ne, sql } from 'drizzle-orm'
import { evaluateRecord, type EvaluationPoint } from '#shared/pipeline/evaluateRecord'
import type { IndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import { alarmContext, measureOf } from '#shared/pipeline/ruleMeasure'
import { deriveTagStatus, leadingIndicator } from '#shared/pipeline/tagStatus'
import type { AlarmClass, AlarmState, TagMeasure } from '#shared/alarms/vocabulary'
import { alarmRules, alarms, indicatorPoints, indicatorSettings, tagAnalysisState, tagStatus, tags } from '../db/schema'

/** Most new samples one tick takes from a tag; a longer backlog is caught up over later ticks. */
export const MAX_NEW_SAMPLES_PER_TICK = 50_000
/** Detrending warm-up before the oldest window a tick evaluates, in detrending bandwidths. */
const WARMUP_BANDWIDTHS = 5

interface SampleRows { t: Float64Array, v: Float64Array }

/**
 * One tag's share of a tick, in one transaction: claim the tag (SKIP LOCKED: another instance
 * may hold it), load its new samples and the history the windows need, evaluate, store the
 * indicator points, run its rules, refresh its status and move its claim forward. A crash
 * anywhere leaves the tag exactly as before, and the next tick redoes it.
 * Returns null when another worker holds the tag.
 */
export async function processTag(db: Db, tagId: number, ctx: ChangeContext, clock: StageClock, now = Date.now() / 1000) {
  return db.transaction(async (tx) => {
    const [claim] = await tx.select().from(tagAnalysisState).where(eq(tagAnalysisState.tagId, tagId)).for('update', { skipLocked: true })
    if (!claim) return null
    const [tag] = await tx.select().from(tags).where(eq(tags.id, tagId))
    const [settings] = await tx.select().from(indicatorSettings).where(eq(indicatorSettings.tagId, tagId))
    if (!tag || !settings) return null
    const loaded = await clock.run('load samples', () => loadRecord(tx, tagId, claim.lastSampleTime, settings, tag.samplePeriodS, claim.samplesSinceEvaluation))
    if (loaded.newCount === 0) return { samples: 0, evaluations: 0 }
    const { t, v } = loaded.rows
    const firstNew = t.length - loaded.newCount
    const result = evaluateRecord({
      tagId, times: t, values: v, firstNew, samplesSinceEvaluation: claim.samplesSinceEvaluation, samplePeriodS: tag.samplePeriodS, settings,
    }, clock.sync)
    const previous = await latestStoredPoint(tx, tagId)
    await clock.run('store points', () => storePoints(tx, tagId, result.points))
    const latest = result.points.at(-1) ?? previous
    await clock.run('rules and alarms', async () => {
      const runtimes = await loadRuleRuntimes(tx, { tagId })
      if (runtimes.length === 0) return
      let next = 0
      let current = previous
      for (let i = firstNew; i < t.length; i++) {
        for (const rt of runtimes) {
          if (rt.rule.measure === 'value') await observe(tx, rt, t[i]!, v[i]!, () => alarmContext(current), ctx)
        }
        while (next < result.points.length && result.points[next]!.time <= t[i]!) {
          current = result.points[next++]!
          for (const rt of runtimes) {
            if (rt.rule.measure !== 'value') await observe(tx, rt, current.time, measureOf(current, rt.rule.measure as Exclude<TagMeasure, 'value'>), () => alarmContext(current), ctx)
          }
        }
      }
      await saveRuleRuntimes(tx, runtimes)
    })
    const lastTime = t[t.length - 1]!
    await clock.run('status', () => storeStatus(tx, tag, latest, v[v.length - 1]!, lastTime, now))
    await tx.update(tagAnalysisState).set({
      lastSampleTime: new Date(Math.round(lastTime * 1000)),
      lastEvaluatedTime: result.points.length > 0 ? new Date(Math.round(result.points.at(-1)!.time * 1000)) : claim.lastEvaluatedTime,
      samplesSinceEvaluation: result.samplesSinceEvaluation,
      updatedAt: new Date(),
    }).where(eq(tagAnalysisState.tagId, tagId))
    return { samples: loaded.newCount, evaluations: result.points.length }
  })
}

/** New samples after the claim (bad-quality readings left out), preceded by the history the windows need. */
async function loadRecord(tx: DbTransaction, tagId: number, after: Date | null, settings: IndicatorSettings, samplePeriodS: number, sinceEvaluation: number) {
  const since = after ?? new Date(0)
  const fresh = await tx.execute<{ t: number, v: number }>(sql`
    select extract(epoch from time)::float8 as t, value as v from samples
    where tag_id = ${tagId} and time > ${since.toISOString()}::timestamptz and quality < 2
    order by time limit ${MAX_NEW_SAMPLES_PER_TICK}`)
  if (fresh.length === 0) return { newCount: 0, rows: { t: new Float64Array(), v: new Float64Array() } }
  const warmup = Math.ceil(WARMUP_BANDWIDTHS * settings.detrendBandwidthS / samplePeriodS)
  // History is only needed when this batch reaches an evaluation; most ticks only carry new samples.
  const evaluates = sinceEvaluation + fresh.length >= settings.evaluateEvery
  const history = after === null || !evaluates ? [] : await tx.execute<{ t: number, v: number }>(sql`
    select extract(epoch from time)::float8 as t, value as v from samples
    where tag_id = ${tagId} and time <= ${since.toISOString()}::timestamptz and quality < 2
    order by time desc limit ${settings.trendWindowSamples + warmup}`)
  const rows = [...Array.from(history).reverse(), ...Array.from(fresh)]
  const out: SampleRows = { t: Float64Array.from(rows, r => Number(r.t)), v: Float64Array.from(rows, r => Number(r.v)) }
  return { newCount: fresh.length, rows: out }
}

async function storePoints(tx: DbTransaction, tagId: number, points: EvaluationPoint[]) {
  if (points.length === 0) return
  await tx.insert(indicatorPoints).values(points.map(p => ({
    tagId,
    time: new Date(Math.round(p.time * 1000)),
    quality: p.quality,
    variance: p.variance, std: p.std, cv: p.cv, ar1: p.ar1, recoveryRate: p.recoveryRate, skewness: p.skewness, kurtosis: p.kurtosis,
    tauAr1: p.tauAr1, pAr1: p.pAr1, tauVariance: p.tauVariance, pVariance: p.pVariance, evidence: p.evidence,
    foldSeconds: p.fold.kind === 'projected' ? p.fold.seconds : null,
    foldLowSeconds: p.fold.kind === 'projected' ? p.fold.lowSeconds : null,
    foldHighSeconds: p.fold.kind === 'projected' ? p.fold.highSeconds : null,
  }))).onConflictDoNothing()
}

/** The newest stored evaluation of a tag, in the shape the engine returns. */
async function latestStoredPoint(tx: DbTransaction, tagId: number): Promise<EvaluationPoint | null> {
  const [row] = await tx.select().from(indicatorPoints).where(eq(indicatorPoints.tagId, tagId))
    .orderBy(sql`${indicatorPoints.time} desc`).limit(1)
  if (!row) return null
  return {
    time: row.time.getTime() / 1000, quality: row.quality, variance: row.variance, std: row.std, cv: row.cv, ar1: row.ar1,
    recoveryRate: row.recoveryRate, skewness: row.skewness, kurtosis: row.kurtosis, tauAr1: row.tauAr1, pAr1: row.pAr1,
    tauVariance: row.tauVariance, pVariance: row.pVariance, evidence: row.evidence as EvaluationPoint['evidence'],
    fold: row.foldSeconds === null ? { kind: 'none' } : { kind: 'projected', seconds: row.foldSeconds, lowSeconds: row.foldLowSeconds!, highSeconds: row.foldHighSeconds! },
  }
}

async function storeStatus(tx: DbTransaction, tag: typeof tags.$inferSelect, latest: EvaluationPoint | null, latestValue: number, latestTime: number, now: number) {
  const open = await tx.select({ alarmClass: alarms.alarmClass, state: alarms.state, name: alarmRules.name }).from(alarms)
    .innerJoin(alarmRules, eq(alarmRules.id, alarms.ruleId))
    .where(and(eq(alarms.tagId, tag.id), ne(alarms.state, 'normal')))
  const { status, reason } = deriveTagStatus({
    now, latestTime, samplePeriodS: tag.samplePeriodS, latest,
    openAlarms: open.map(a => ({ alarmClass: a.alarmClass as AlarmClass, state: a.state as AlarmState, name: a.name })),
  })
  const lead = leadingIndicator(latest)
  const fold = latest?.fold ?? { kind: 'none' as const }
  const row = {
    status, reason, latestValue, latestTime: new Date(Math.round(latestTime * 1000)),
    leadingIndicator: lead?.name ?? null, leadingValue: lead?.value ?? null, tau: lead?.tau ?? null, pValue: lead?.p ?? null,
    foldKind: fold.kind === 'projected' ? 'projected' : 'none',
    foldSeconds: fold.kind === 'projected' ? fold.seconds : null,
    foldLowSeconds: fold.kind === 'projected' ? fold.lowSeconds : null,
    foldHighSeconds: fold.kind === 'projected' ? fold.highSeconds : null,
    unackedAlarms: open.filter(a => a.state === 'unacknowledged' || a.state === 'rtn_unacknowledged').length,
    updatedAt: new Date(),
  }
  await tx.insert(tagStatus).values({ tagId: tag.id, ...row }).onConflictDoUpdate({ target: tagStatus.tagId, set: row })
}
