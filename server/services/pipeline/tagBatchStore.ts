import { and, eq, getTableColumns, inArray, ne, sql, type SQL } from 'drizzle-orm'
import type { PgTable } from 'drizzle-orm/pg-core'
import type { EvaluationPoint } from '#shared/pipeline/evaluateRecord'
import { deriveTagStatus, leadingIndicator } from '#shared/pipeline/tagStatus'
import type { AlarmClass, AlarmState } from '#shared/alarms/vocabulary'
import { alarmRules, alarms, indicatorPoints, tagStatus, type tags } from '../../db/schema'
import { jsonParam } from './tagBatchLoad'
import type { DbTransaction } from '../../utils/db'

/** Rows per insert statement: PostgreSQL allows 65,535 bound parameters, a point has 19 columns. */
const POINT_ROWS_PER_INSERT = 2_000

const msDate = (seconds: number) => new Date(Math.round(seconds * 1000))
const foldColumns = (fold: EvaluationPoint['fold']) => ({
  foldSeconds: fold.kind === 'projected' ? fold.seconds : null,
  foldLowSeconds: fold.kind === 'projected' ? fold.lowSeconds : null,
  foldHighSeconds: fold.kind === 'projected' ? fold.highSeconds : null,
})

/** Stores each tag's points with the settings version that produced them (null: never-edited starting values). */
export async function storePoints(
  tx: DbTransaction, byTag: { tagId: number, settingsVersionId: number | null, points: EvaluationPoint[] }[],
): Promise<void> {
  const rows = byTag.flatMap(({ tagId, settingsVersionId, points }) => points.map(p => ({
    tagId,
    settingsVersionId,
    time: msDate(p.time),
    quality: p.quality,
    variance: p.variance, std: p.std, cv: p.cv, ar1: p.ar1, recoveryRate: p.recoveryRate, skewness: p.skewness, kurtosis: p.kurtosis,
    tauAr1: p.tauAr1, pAr1: p.pAr1, tauVariance: p.tauVariance, pVariance: p.pVariance, evidence: p.evidence,
    ...foldColumns(p.fold),
  })))
  for (let i = 0; i < rows.length; i += POINT_ROWS_PER_INSERT)
    await tx.insert(indicatorPoints).values(rows.slice(i, i + POINT_ROWS_PER_INSERT)).onConflictDoNothing()
}

export interface TagStatusRow {
  tag: typeof tags.$inferSelect
  latest: EvaluationPoint | null
  latestValue: number
  latestTime: number
}

/** Derives and upserts the overview status of each tag from its latest evaluation and its open alarms. */
export async function storeStatuses(tx: DbTransaction, inputs: TagStatusRow[], now: number): Promise<void> {
  if (inputs.length === 0) return
  const open = await tx.select({ tagId: alarms.tagId, alarmClass: alarms.alarmClass, state: alarms.state, name: alarmRules.name })
    .from(alarms)
    .innerJoin(alarmRules, eq(alarmRules.id, alarms.ruleId))
    .where(and(inArray(alarms.tagId, inputs.map(i => i.tag.id)), ne(alarms.state, 'normal')))
  const rows = inputs.map(({ tag, latest, latestValue, latestTime }) => {
    const openAlarms = open.filter(a => a.tagId === tag.id)
      .map(a => ({ alarmClass: a.alarmClass as AlarmClass, state: a.state as AlarmState, name: a.name }))
    const { status, reason } = deriveTagStatus({ now, latestTime, samplePeriodS: tag.samplePeriodS, latest, openAlarms })
    const lead = leadingIndicator(latest)
    const fold = latest?.fold ?? { kind: 'none' as const }
    return {
      tagId: tag.id, status, reason, latestValue, latestTime: msDate(latestTime),
      leadingIndicator: lead?.name ?? null, leadingValue: lead?.value ?? null, tau: lead?.tau ?? null, pValue: lead?.p ?? null,
      foldKind: fold.kind === 'projected' ? 'projected' : 'none',
      ...foldColumns(fold),
      unackedAlarms: openAlarms.filter(a => a.state === 'unacknowledged' || a.state === 'rtn_unacknowledged').length,
      updatedAt: new Date(),
    }
  })
  await tx.insert(tagStatus).values(rows).onConflictDoUpdate({ target: tagStatus.tagId, set: excludedExcept(tagStatus, 'tagId') })
}

/** `set column = excluded.column` for every column but the key, for a multi-row upsert. */
function excludedExcept(table: PgTable, key: string): Record<string, SQL> {
  return Object.fromEntries(Object.entries(getTableColumns(table)).filter(([name]) => name !== key)
    .map(([name, column]) => [name, sql.raw(`excluded.${column.name}`)]))
}

export interface ClaimAdvance {
  tagId: number
  lastSampleTime: number
  lastEvaluatedTime: Date | null
  samplesSinceEvaluation: number
}

/** Moves each tag's claim past the samples this batch processed (same transaction as the results). */
export async function advanceClaims(tx: DbTransaction, advances: ClaimAdvance[]): Promise<void> {
  if (advances.length === 0) return
  await tx.execute(sql`
    update tag_analysis_state st set last_sample_time = c.last_sample_time, last_evaluated_time = c.last_evaluated_time,
      samples_since_evaluation = c.samples_since_evaluation, updated_at = now()
    from jsonb_to_recordset(${jsonParam(advances.map(a => ({
      tag_id: a.tagId,
      last_sample_time: msDate(a.lastSampleTime).toISOString(),
      last_evaluated_time: a.lastEvaluatedTime?.toISOString() ?? null,
      samples_since_evaluation: a.samplesSinceEvaluation,
    })))}) as c(tag_id int, last_sample_time timestamptz, last_evaluated_time timestamptz, samples_since_evaluation int)
    where st.tag_id = c.tag_id`)
}
