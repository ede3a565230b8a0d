import { and, asc, eq, inArray, isNull, lt, ne, or } from 'drizzle-orm'
import { INACTIVE, stepCondition, type ConditionState } from '#shared/alarms/conditionTracker'
import { alarmRuleStates, alarmRules, alarms } from '../db/schema'

/** A rule with its condition state, advanced in memory during a tick and stored at its end. */
export interface RuleRuntime {
  rule: AlarmRuleRow
  state: ConditionState
  lastValue: number | null
  lastTime: number | null
}

const seconds = (d: Date | null) => (d ? d.getTime() / 1000 : null)
const date = (s: number | null) => (s === null ? null : new Date(Math.round(s * 1000)))

/** The in-service-or-not rules on a tag (or a unit's own rules), with their states locked. */
export async function loadRuleRuntimes(tx: DbTransaction, target: { tagId: number } | { unitId: number }): Promise<RuleRuntime[]> {
  const where = 'tagId' in target
    ? eq(alarmRules.tagId, target.tagId)
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
 */
export async function observe(tx: DbTransaction, rt: RuleRuntime, time: number, value: number, context: () => Record<string, unknown>, ctx: ChangeContext): Promise<void> {
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
  await transitionAlarm(tx, open, step.change, ctx, { conditionTime: at, value: Number.isFinite(value) ? value : null }).catch((err) => {
    // The point's stored state already reflects this change (e.g. set aside and re-synced): keep going.
    if (!(err instanceof AlarmTransitionRefused)) throw err
  })
}

/** Stores the rules' condition states and refreshes the latest value shown on their open alarms. */
export async function saveRuleRuntimes(tx: DbTransaction, runtimes: RuleRuntime[]): Promise<void> {
  for (const rt of runtimes) {
    await tx.update(alarmRuleStates).set({
      active: rt.state.active, pendingSince: date(rt.state.pendingSince), clearingSince: date(rt.state.clearingSince),
      lastValue: rt.lastValue, lastTime: date(rt.lastTime),
    }).where(eq(alarmRuleStates.ruleId, rt.rule.id))
    if (rt.lastValue !== null) {
      await tx.update(alarms).set({ lastValue: rt.lastValue, lastValueAt: date(rt.lastTime) })
        .where(and(eq(alarms.ruleId, rt.rule.id), ne(alarms.state, 'normal'), or(isNull(alarms.lastValueAt), lt(alarms.lastValueAt, date(rt.lastTime)!))))
    }
  }
}
