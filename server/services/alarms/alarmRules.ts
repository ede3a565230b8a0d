import { and, asc, eq, type SQL } from 'drizzle-orm'
import type { AlarmState, RuleMode } from '#shared/alarms/vocabulary'
import type { AlarmRuleCreate, AlarmRulePatch } from '#shared/schemas/alarmRule'
import { alarmRules, tags, units } from '../../db/schema'
import type { Db, DbTransaction } from '../../utils/db'
import type { ChangeContext } from '../../utils/changeContext'
import { lockOpenAlarm, modeEvent, transitionAlarm } from './alarmTransitions'

export function listRules(db: Db, filters: { unitId?: number, tagId?: number, disabled?: 'include' | 'exclude' }) {
  const where: SQL[] = filters.disabled === 'include' ? [] : [eq(alarmRules.enabled, true)]
  if (filters.unitId) where.push(eq(alarmRules.unitId, filters.unitId))
  if (filters.tagId) where.push(eq(alarmRules.tagId, filters.tagId))
  return db.select({ rule: alarmRules, tagCode: tags.code, unitCode: units.code }).from(alarmRules)
    .innerJoin(units, eq(units.id, alarmRules.unitId))
    .leftJoin(tags, eq(tags.id, alarmRules.tagId))
    .where(and(...where))
    .orderBy(asc(units.code), asc(alarmRules.name))
    .then(rows => rows.map(r => ({ ...r.rule, tagCode: r.tagCode, unitCode: r.unitCode })))
}

export async function getRule(db: Db, id: number) {
  const [row] = await db.select().from(alarmRules).where(eq(alarmRules.id, id))
  return row
}

/** Plain error: the rule's target does not exist (the route answers 400 naming the field). */
export class RuleTargetMissing extends Error {
  constructor(readonly field: 'tagId' | 'unitId', id: number) {
    super(`${field}: ${field === 'tagId' ? 'tag' : 'unit'} ${id} does not exist`)
  }
}

/** Creates a rule on a tag (its unit and site follow from the tag) or on a unit. */
export async function createRule(tx: DbTransaction, input: AlarmRuleCreate, userId: number) {
  const target = input.targetKind === 'tag'
    ? (await tx.select({ siteId: tags.siteId, unitId: tags.unitId }).from(tags).where(eq(tags.id, input.tagId!)))[0]
    : (await tx.select({ siteId: units.siteId, unitId: units.id }).from(units).where(eq(units.id, input.unitId!)))[0]
  if (!target) throw input.targetKind === 'tag' ? new RuleTargetMissing('tagId', input.tagId!) : new RuleTargetMissing('unitId', input.unitId!)
  const { tagId, unitId: _unitId, ...fields } = input
  const [rule] = await tx.insert(alarmRules).values({
    ...fields, tagId: input.targetKind === 'tag' ? tagId! : null, siteId: target.siteId, unitId: target.unitId, updatedBy: userId,
  }).returning()
  return rule!
}

/**
 * Changes a rule. A new mode (in service, suppressed by design, out of service) moves its open
 * alarm through the lifecycle in the same transaction, with an event naming who did it.
 */
export async function updateRule(tx: DbTransaction, id: number, patch: AlarmRulePatch, ctx: ChangeContext) {
  const [before] = await tx.select().from(alarmRules).where(eq(alarmRules.id, id)).for('update')
  if (!before) return undefined
  const [rule] = await tx.update(alarmRules).set({ ...patch, updatedAt: new Date(), updatedBy: ctx.userId })
    .where(eq(alarmRules.id, id)).returning()
  if (patch.mode && patch.mode !== before.mode) {
    const open = await lockOpenAlarm(tx, id)
    const event = open && modeEvent(open.state as AlarmState, patch.mode as RuleMode)
    if (open && event) await transitionAlarm(tx, open, event, ctx, { comment: `rule set ${patch.mode.replace(/_/g, ' ')}` })
  }
  const changed = Object.fromEntries(Object.keys(patch)
    .map(k => [k, { from: before[k as keyof typeof before], to: rule![k as keyof typeof rule] }]))
  return { rule: rule!, changed }
}
