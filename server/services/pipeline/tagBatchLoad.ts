import { eq, inArray, sql } from 'drizzle-orm'
import type { EvaluationPoint } from '#shared/pipeline/evaluateRecord'
import { indicatorSettings, tagAnalysisState, tags } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'

/** Most new samples one tick takes from a tag; a longer backlog is caught up over later ticks. */
export const MAX_NEW_SAMPLES_PER_TICK = 50_000
/** Detrending warm-up before the oldest window a tick evaluates, in detrending bandwidths. */
const WARMUP_BANDWIDTHS = 5

/**
 * Samples of history a tag's windows need before its new samples: a full trend window and the
 * detrending warm-up before it. The replay job loads the same, so it evaluates as a tick does.
 */
export function historySamples(settings: Pick<typeof indicatorSettings.$inferSelect, 'trendWindowSamples' | 'detrendBandwidthS'>, samplePeriodS: number): number {
  return settings.trendWindowSamples + Math.ceil(WARMUP_BANDWIDTHS * settings.detrendBandwidthS / samplePeriodS)
}

export interface TagClaim {
  claim: typeof tagAnalysisState.$inferSelect
  tag: typeof tags.$inferSelect
  settings: typeof indicatorSettings.$inferSelect
}

/** A claimed tag with its new samples, preceded by the history its windows need. */
export interface TagRecord extends TagClaim {
  t: Float64Array
  v: Float64Array
  /** Each sample's stored quality code (good or uncertain: bad ones are not loaded). */
  q: Uint8Array
  newCount: number
}

/** A list of values as one parameter: the same statement text whatever the batch size. */
export const jsonParam = (rows: unknown[]) => sql`${JSON.stringify(rows)}::jsonb`

/**
 * Locks the claim rows of the tags no other worker holds (SKIP LOCKED), with each tag's
 * definition and settings; only the claim rows are locked, so settings stay editable.
 */
export async function claimTags(tx: DbTransaction, tagIds: number[]): Promise<TagClaim[]> {
  return tx.select({ claim: tagAnalysisState, tag: tags, settings: indicatorSettings }).from(tagAnalysisState)
    .innerJoin(tags, eq(tags.id, tagAnalysisState.tagId))
    .innerJoin(indicatorSettings, eq(indicatorSettings.tagId, tagAnalysisState.tagId))
    .where(inArray(tagAnalysisState.tagId, tagIds))
    .orderBy(tagAnalysisState.tagId)
    .for('update', { of: tagAnalysisState, skipLocked: true })
}

/**
 * Each claimed tag's new samples after its claim up to the horizon (bad-quality readings left out) and, for the
 * tags whose batch reaches an evaluation, the history before it: two statements for the batch.
 */
export async function loadRecords(tx: DbTransaction, claims: TagClaim[], horizon: Date): Promise<TagRecord[]> {
  const fresh = await sampleWindows(tx, 'oldest', claims.map(c => ({
    tagId: c.tag.id, after: c.claim.lastSampleTime, until: horizon, limit: MAX_NEW_SAMPLES_PER_TICK,
  })))
  // History is only needed when this batch reaches an evaluation; most ticks only carry new samples.
  const needHistory = claims.filter((c) => {
    const count = fresh.get(c.tag.id)?.t.length ?? 0
    return count > 0 && c.claim.lastSampleTime !== null && c.claim.samplesSinceEvaluation + count >= c.settings.evaluateEvery
  })
  const history = await sampleWindows(tx, 'newest', needHistory.map(c => ({
    tagId: c.tag.id, after: null, until: c.claim.lastSampleTime,
    limit: historySamples(c.settings, c.tag.samplePeriodS),
  })))
  return claims.map((c) => {
    const before = history.get(c.tag.id) ?? NO_SAMPLES
    const after = fresh.get(c.tag.id) ?? NO_SAMPLES
    return {
      ...c, t: joined(Float64Array, before.t, after.t), v: joined(Float64Array, before.v, after.v),
      q: joined(Uint8Array, before.q, after.q), newCount: after.t.length,
    }
  })
}

interface SampleArrays { t: number[], v: number[], q: number[] }
const NO_SAMPLES: SampleArrays = { t: [], v: [], q: [] }

function joined<A extends Float64Array | Uint8Array>(Kind: new (length: number) => A, first: number[], second: number[]): A {
  const out = new Kind(first.length + second.length)
  out.set(first)
  out.set(second, first.length)
  return out
}

interface SampleWindow { tagId: number, after: Date | null, until: Date | null, limit: number }

/**
 * Up to `limit` good samples of each tag in (after, until], the oldest or the newest of them,
 * in time order. One index range scan per tag; each tag's samples come back as two arrays, so
 * no sort over the whole batch is needed.
 */
async function sampleWindows(tx: DbTransaction, end: 'oldest' | 'newest', windows: SampleWindow[]): Promise<Map<number, SampleArrays>> {
  if (windows.length === 0) return new Map()
  const rows = await tx.execute<{ tag_id: number, t: number[] | null, v: number[] | null, q: number[] | null }>(sql`
    select c.tag_id, s.t, s.v, s.q
    from jsonb_to_recordset(${jsonParam(windows.map(w => ({
      tag_id: w.tagId, after: w.after?.toISOString() ?? '-infinity', until: w.until?.toISOString() ?? 'infinity', n: w.limit,
    })))}) as c(tag_id int, after timestamptz, until timestamptz, n int)
    cross join lateral (
      select array_agg(extract(epoch from w.time)::float8 order by w.time) as t, array_agg(w.value order by w.time) as v,
        array_agg(w.quality order by w.time) as q
      from (select time, value, quality from samples
        where tag_id = c.tag_id and time > c.after and time <= c.until and quality < 2
        order by time ${sql.raw(end === 'oldest' ? 'asc' : 'desc')} limit c.n) w) s`)
  return new Map(rows.map(r => [Number(r.tag_id), { t: (r.t ?? []).map(Number), v: (r.v ?? []).map(Number), q: (r.q ?? []).map(Number) }]))
}

export type StoredPointRow = {
  tag_id: number, time_s: number, quality: string | null, variance: number | null, std: number | null, cv: number | null,
  ar1: number | null, recovery_rate: number | null, skewness: number | null, kurtosis: number | null, tau_ar1: number | null,
  p_ar1: number | null, tau_variance: number | null, p_variance: number | null, evidence: string | null,
  fold_seconds: number | null, fold_low_seconds: number | null, fold_high_seconds: number | null,
}

/** The newest stored evaluation of each tag, in the shape the engine returns (one index probe per tag). */
export async function latestStoredPoints(tx: DbTransaction, tagIds: number[]): Promise<Map<number, EvaluationPoint>> {
  const rows = await tx.execute<StoredPointRow>(sql`
    select p.*, extract(epoch from p.time)::float8 as time_s
    from jsonb_array_elements_text(${jsonParam(tagIds)}) as c(tag_id)
    cross join lateral (select * from indicator_points where tag_id = c.tag_id::int order by time desc limit 1) p`)
  return new Map(rows.map(row => [Number(row.tag_id), storedPoint(row)]))
}

/** A stored indicator_points row (with its time as epoch seconds) in the shape the engine returns. */
export function storedPoint(row: StoredPointRow): EvaluationPoint {
  return {
    time: Number(row.time_s), quality: row.quality, variance: row.variance, std: row.std, cv: row.cv, ar1: row.ar1,
    recoveryRate: row.recovery_rate, skewness: row.skewness, kurtosis: row.kurtosis, tauAr1: row.tau_ar1, pAr1: row.p_ar1,
    tauVariance: row.tau_variance, pVariance: row.p_variance, evidence: row.evidence as EvaluationPoint['evidence'],
    fold: row.fold_seconds === null
      ? { kind: 'none' }
      : { kind: 'projected', seconds: row.fold_seconds, lowSeconds: row.fold_low_seconds!, highSeconds: row.fold_high_seconds! },
  }
}
