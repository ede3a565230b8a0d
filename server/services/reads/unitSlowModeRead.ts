import { findActivationMarks } from '../alarms/activationMarks'
import { SERIES_RANGES, type SeriesRange } from '#shared/schemas/series'
import { buildUnitSlowMode, slowModeWindow } from '#shared/utils/unitSlowMode'
import type { Db } from '../../utils/db'
import { loadSamplesSince } from './tagSeriesRead'

export async function findUnitTags(db: Db, unitId: number) {
  const [unit] = await db.$sql<{ id: number, code: string, name: string, kind: string }[]>`
    select id, code, name, kind from units where id = ${unitId}`
  if (!unit) return undefined
  const tags = await db.$sql<{ id: number, code: string, description: string, samplePeriodS: number }[]>`
    select id, code, description, sample_period_s as "samplePeriodS" from tags
    where unit_id = ${unitId} and watched order by code`
  return { unit, tags }
}

/** The unit's own rules on its slowest recovery rate (threshold lines) and their alarms' activations in the range (markers). */
async function findUnitRuleMarks(db: Db, unitId: number, fromS: number, toS: number) {
  const [thresholds, markers] = await Promise.all([
    db.$sql<{ threshold: number, comparison: string, priority: string, name: string }[]>`
      select threshold, comparison, priority, name from alarm_rules
      where unit_id = ${unitId} and target_kind = 'unit' and enabled and mode <> 'out_of_service'`,
    findActivationMarks(db, { unitId }, fromS, toS),
  ])
  return { thresholds, markers }
}

/** The unit's slow mode over the range ending now, or undefined for an unknown unit. */
export async function readUnitSlowMode(db: Db, unitId: number, range: SeriesRange, nowMs = Date.now()) {
  const found = await findUnitTags(db, unitId)
  if (!found) return undefined
  const to = nowMs / 1000
  const from = to - SERIES_RANGES[range]
  // One fit window before the range, so the recovery-rate history starts where the range does.
  const lead = found.tags.length ? slowModeWindow(found.tags.map(t => t.samplePeriodS), to - from).leadSeconds : 0
  const samples = await Promise.all(found.tags.map(tag => loadSamplesSince(db, tag.id, from - lead, to)))
  const view = found.tags.length === 0
    ? null
    : buildUnitSlowMode(found.tags.map((tag, i) => ({ tagId: tag.id, samplePeriodS: tag.samplePeriodS, ...samples[i]! })), { from, to })
  return { ...found, range, from, to, slowMode: view, ...await findUnitRuleMarks(db, unitId, from, to) }
}
