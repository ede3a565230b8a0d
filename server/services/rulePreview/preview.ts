import { and, eq, ne, sql, type SQL } from 'drizzle-orm'
import type { AlarmRuleCreate } from '#shared/schemas/alarmRule'
import { ruleActivations } from '#shared/pipeline/ruleReplay'
import { firingSummary, prioritySpread, valueActivations } from '#shared/utils/rulePreview'
import { alarmRules, sites, tags, units } from '../../db/schema'
import { storedPoint, type StoredPointRow } from '../pipeline/tagBatchLoad'
import { loadSamplesSince } from '../reads/tagSeriesRead'

/** The preview looks back a week from the target's newest data. */
export const RULE_PREVIEW_SPAN_S = 7 * 86_400
/** Activation times returned for the chart; the count and warnings use them all. */
const MAX_LISTED = 500

/**
 * How often a draft rule would have fired over the last 7 days of its target's data, through
 * the live condition tracker: raw samples for a value rule, the stored indicator points (what
 * the live pipeline computed) for an indicator rule, the unit's slow mode for a unit rule.
 */
export async function previewRule(db: Db, rule: AlarmRuleCreate, ruleId?: number) {
  const target = rule.targetKind === 'tag'
    ? (await db.select({ siteId: tags.siteId, timeZone: sites.timeZone }).from(tags)
        .innerJoin(sites, eq(sites.id, tags.siteId)).where(eq(tags.id, rule.tagId!)))[0]
    : (await db.select({ siteId: units.siteId, timeZone: sites.timeZone }).from(units)
        .innerJoin(sites, eq(sites.id, units.siteId)).where(eq(units.id, rule.unitId!)))[0]
  if (!target) return undefined
  const observed = await observations(db, rule)
  const toS = observed.newest ?? Date.now() / 1000
  const fromS = toS - RULE_PREVIEW_SPAN_S
  const activations = observed.activations().filter(t => t >= fromS)
  const others = await db.select({ priority: alarmRules.priority }).from(alarmRules).where(and(
    eq(alarmRules.siteId, target.siteId), eq(alarmRules.enabled, true), eq(alarmRules.alarmClass, 'alarm'),
    ...(ruleId ? [ne(alarmRules.id, ruleId)] : []) as SQL[]))
  const priorities = [...others.map(o => o.priority), ...(rule.alarmClass === 'alarm' ? [rule.priority] : [])]
  return {
    fromS, toS, timeZone: target.timeZone, basis: observed.basis,
    activations: activations.slice(0, MAX_LISTED),
    summary: firingSummary(activations, toS - fromS),
    spread: prioritySpread(priorities),
  }
}

async function observations(db: Db, rule: AlarmRuleCreate) {
  const condition = rule
  if (rule.targetKind === 'unit') {
    const rows = await db.$sql<{ t: number, v: number | null }[]>`
      select extract(epoch from time)::float8 as t, recovery_rate as v from unit_slow_mode
      where unit_id = ${rule.unitId!} and time >= (select max(time) from unit_slow_mode where unit_id = ${rule.unitId!}) - interval '7 days' order by time`
    return {
      basis: 'unit slow mode' as const,
      newest: rows.at(-1)?.t ?? null,
      activations: () => valueActivations(rows.map(r => r.t), rows.map(r => r.v ?? Number.NaN), condition),
    }
  }
  const tagId = rule.tagId!
  const [newest] = await db.$sql<{ t: number | null }[]>`select extract(epoch from max(time))::float8 as t from samples where tag_id = ${tagId}`
  const newestS = newest?.t ?? null
  if (rule.measure === 'value') {
    const { times, values } = await loadSamplesSince(db, tagId, (newestS ?? Date.now() / 1000) - RULE_PREVIEW_SPAN_S)
    return { basis: 'raw samples' as const, newest: newestS, activations: () => valueActivations(times, values, condition) }
  }
  const measure = rule.measure
  const rows = await db.execute<StoredPointRow>(sql`
    select p.*, extract(epoch from p.time)::float8 as time_s from indicator_points p
    where p.tag_id = ${tagId} and p.time >= to_timestamp(${(newestS ?? Date.now() / 1000) - RULE_PREVIEW_SPAN_S}) order by p.time`)
  const points = rows.map(storedPoint)
  return { basis: 'stored indicator points' as const, newest: newestS, activations: () => ruleActivations(points, measure, condition) }
}
