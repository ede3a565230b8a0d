import { and, asc, eq, inArray, ne, sql } from 'drizzle-orm'
import { INACTIVE, stepCondition, type ConditionState } from '#shared/alarms/conditionTracker'
import { alarmRuleStates, alarmRules, alarms } from '../../db/schema'
import type { AlarmRuleRow } from '../../db/schema'
import { jsonParam } from './tagBatchLoad'
import type { DbTransaction } from '../../utils/db'
import type { ChangeContext } from '../../utils/changeContext'
import { lockOpenAlarm, raiseAlarm, transitionAlarm } from '../alarms/alarmTransitions'
import { AlarmTransitionRefused } from '../alarms/alarmErrors'

/** A rule with its condition state, advanced in memory during a tick and stored at its end. */
export interface RuleRuntime {
  rule: AlarmRuleRow
  state: ConditionState
  lastValue: number | null
  lastTime: number | null
}

const seconds = (d: Date | null) => (d ? d.getTime() / 1000 : null)
const date = (s: number | null) => (s === null ? null : new Date(Math.round(s * 1000)))
const iso = (s: number | null) => date(s)?.toISOString() ?? null

/** The in-service-or-not rules on some tags (or a unit's own rules), with their states locked. */
export async function loadRuleRuntimes(tx: DbTransaction, target: { tagIds: number[] } | { unitId: number }): Promise<RuleRuntime[]> {
  if ('tagIds' in target && target.tagIds.length === 0) return []
  const where = 'tagIds' in target
    ? inArray(alarmRules.tagId, target.tagIds)
    : and(eq(alarmRules.unitId, target.unitId), eq(alarmRules.targetKind, 'unit'))
  const rules = await tx.select().from(alarmRules).where(and(where, eq(alarmRules.enabled, true))).orderBy(asc(alarmRules.id))
  if (rules.length === 0) return []
  const ids = rules.map(r => r.id)
  await tx.insert(alarmRuleStates).values(ids.map(ruleId => ({ ruleId }))).onConflictDoNothing()
  const states = await tx.select().from(alarmRuleStates).where(inArray(alarmRuleStates.ruleId, ids)).orderBy(asc(alarmRuleStates.ruleId)).for('update')
  // Lock their open alarms up front in id order, the order acknowledgements lock in: no deadlock.
  await tx.select({ id: alarms.id }).from(alarms).where(and(inArray(alarms.ruleId, ids), ne(alarms.state, 'normal'))).orderBy(asc(alarms.id)).for('update')
  const byRule = new Map(states.map(s => [s.ruleId, s]))
  return rules.map((rule) => {
    const s = byRule.get(rule.id)
    return {
      rule,
      state: s ? { active: s.active, pendingSince: seconds(s.pendingSince), clearingSince: seconds(s.clearingSince) } : { ...INACTIVE },
      lastValue: s?.lastValue ?? null,
      lastTime: seconds(s?.lastTime ?? null),
    }
  })
}

/**
 * Feeds one observation to a rule; an activation or return moves its alarm through the
 * lifecycle (raising a new occurrence when none is open) in the caller's transaction.
 * Without a change it does no database work.
 */
export async function observe(
  tx: DbTransaction, rt: RuleRuntime, time: number, value: number, context: () => Record<string, unknown>, ctx: ChangeContext,
): Promise<void> {
  const step = stepCondition(rt.rule, rt.state, time, value)
  rt.state = step.state
  if (!Number.isNaN(value)) {
    rt.lastValue = Number.isFinite(value) ? value : null
    rt.lastTime = time
  }
  if (!step.change) return
  const at = date(time)!
  const open = await lockOpenAlarm(tx, rt.rule.id)
  if (step.change === 'activate' && !open) {
    await raiseAlarm(tx, rt.rule, { time: at, value, context: context() }, ctx)
    return
  }
  if (!open) return
  await transitionAlarm(tx, open, step.change, ctx, {
    conditionTime: at, value: Number.isFinite(value) ? value : null,
    // A re-activation is described by the facts of now, not those of the first raise.
    context: step.change === 'activate' ? context() : undefined,
  }).catch((err) => {
    // The point's stored state already reflects this change (e.g. set aside and re-synced): keep going.
    if (!(err instanceof AlarmTransitionRefused)) throw err
  })
}

/** Stores the rules' condition states and refreshes the latest value shown on their open alarms (two statements). */
export async function saveRuleRuntimes(tx: DbTransaction, runtimes: RuleRuntime[]): Promise<void> {
  if (runtimes.length === 0) return
  await tx.execute(sql`
    update alarm_rule_states s set active = r.active, pending_since = r.pending_since, clearing_since = r.clearing_since,
      last_value = r.last_value, last_time = r.last_time
    from jsonb_to_recordset(${jsonParam(runtimes.map(rt => ({
      rule_id: rt.rule.id, active: rt.state.active, pending_since: iso(rt.state.pendingSince), clearing_since: iso(rt.state.clearingSince),
      last_value: rt.lastValue, last_time: iso(rt.lastTime),
    })))}) as r(rule_id int, active boolean, pending_since timestamptz, clearing_since timestamptz, last_value float8, last_time timestamptz)
    where s.rule_id = r.rule_id`)
  const withValue = runtimes.filter(rt => rt.lastValue !== null)
  if (withValue.length === 0) return
  await tx.execute(sql`
    update alarms a set last_value = r.last_value, last_value_at = r.last_time
    from jsonb_to_recordset(${jsonParam(withValue.map(rt => ({ rule_id: rt.rule.id, last_value: rt.lastValue, last_time: iso(rt.lastTime) })))})
      as r(rule_id int, last_value float8, last_time timestamptz)
    where a.rule_id = r.rule_id and a.state <> 'normal' and (a.last_value_at is null or a.last_value_at < r.last_time)`)
}
