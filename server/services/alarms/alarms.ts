import { and, asc, desc, eq, gte, inArray, lte, ne, sql, type SQL } from 'drizzle-orm'
import { applyLifecycleEvent } from '#shared/alarms/lifecycle'
import { PRIORITIES } from '#shared/alarms/vocabulary'
import type { AlarmListQuery } from '#shared/schemas/alarm'
import { alarmEvents, alarmRules, alarms, tags, units, users } from '../../db/schema'
import type { AlarmRow } from '../../db/schema'
import type { Db, DbExecutor, DbTransaction } from '../../utils/db'
import { AlarmsNotFound, AlarmTransitionRefused, RequestIdReused } from './alarmErrors'
import type { ChangeContext } from '../../utils/changeContext'
import { alarmLabel, transitionAlarm } from './alarmTransitions'

export type AlarmFilters = Partial<AlarmListQuery> & { limit: number }

const priorityOrder = sql`array_position(${sql.raw(`array[${PRIORITIES.map(p => `'${p}'`).join(',')}]`)}, ${alarms.priority})`

/** Alarm occurrences joined to their rule's rationale and their target's codes. */
function alarmSelection(db: Db | DbExecutor) {
  return db.select({
    id: alarms.id,
    ruleId: alarms.ruleId,
    ruleName: alarmRules.name,
    priority: alarms.priority,
    alarmClass: alarms.alarmClass,
    state: alarms.state,
    conditionActive: alarms.conditionActive,
    measure: alarms.measure,
    comparison: alarms.comparison,
    threshold: alarms.threshold,
    raisedAt: alarms.raisedAt,
    raisedValue: alarms.raisedValue,
    activatedAt: alarms.activatedAt,
    activatedValue: alarms.activatedValue,
    activationCount: alarms.activationCount,
    ackedAt: alarms.ackedAt,
    ackedBy: alarms.ackedBy,
    ackedByName: users.name,
    clearedAt: alarms.clearedAt,
    closedAt: alarms.closedAt,
    shelvedUntil: alarms.shelvedUntil,
    shelveReason: alarms.shelveReason,
    lastValue: alarms.lastValue,
    lastValueAt: alarms.lastValueAt,
    context: alarms.context,
    siteId: alarms.siteId,
    unitId: alarms.unitId,
    unitCode: units.code,
    unitName: units.name,
    tagId: alarms.tagId,
    tagCode: tags.code,
    engineeringUnit: tags.engineeringUnit,
    // The tag's range gives its values' decimals on screens (shared/utils/numberText.ts tagDecimals).
    rangeLow: tags.rangeLow,
    rangeHigh: tags.rangeHigh,
    consequence: alarmRules.consequence,
    likelyCause: alarmRules.likelyCause,
    operatorAction: alarmRules.operatorAction,
  }).from(alarms)
    .innerJoin(alarmRules, eq(alarmRules.id, alarms.ruleId))
    .innerJoin(units, eq(units.id, alarms.unitId))
    .leftJoin(tags, eq(tags.id, alarms.tagId))
    .leftJoin(users, eq(users.id, alarms.ackedBy))
}

/**
 * `active`: every occurrence not back to normal, most urgent first, then by latest activation
 * (a re-raised alarm counts as new). `history`: all occurrences by latest activation, newest
 * first. Filters narrow either view (from/to on the first raise).
 */
export function listAlarms(db: Db | DbExecutor, filters: AlarmFilters) {
  const active = (filters.view ?? 'active') === 'active'
  const where: SQL[] = []
  if (active) where.push(ne(alarms.state, 'normal'))
  if (filters.unitId) where.push(eq(alarms.unitId, filters.unitId))
  if (filters.priority) where.push(eq(alarms.priority, filters.priority))
  if (filters.state) where.push(eq(alarms.state, filters.state))
  if (filters.from) where.push(gte(alarms.raisedAt, filters.from))
  if (filters.to) where.push(lte(alarms.raisedAt, filters.to))
  const order = active ? [asc(priorityOrder), desc(alarms.activatedAt), desc(alarms.id)] : [desc(alarms.activatedAt), desc(alarms.id)]
  return alarmSelection(db).where(and(...where)).orderBy(...order).limit(filters.limit)
}

export type AlarmListRow = Awaited<ReturnType<typeof listAlarms>>[number]

/** One alarm with its full event trail, oldest event first; undefined when unknown. */
export async function getAlarmWithEvents(db: Db, id: number) {
  const [alarm] = await alarmSelection(db).where(eq(alarms.id, id))
  if (!alarm) return undefined
  // Each event with the name of who acted, for the trail on the alarm's page.
  const rows = await db.select({ event: alarmEvents, userName: users.name }).from(alarmEvents)
    .leftJoin(users, eq(users.id, alarmEvents.userId))
    .where(eq(alarmEvents.alarmId, id)).orderBy(asc(alarmEvents.id))
  const events = rows.map(r => ({ ...r.event, userName: r.userName }))
  return { ...alarm, events }
}

/** Locks the named alarms in id order (the order every writer uses, so none deadlock). */
async function lockAlarms(tx: DbTransaction, ids: number[]): Promise<AlarmRow[]> {
  const rows = await tx.select().from(alarms).where(inArray(alarms.id, ids)).orderBy(asc(alarms.id)).for('update')
  const missing = ids.filter(id => !rows.some(r => r.id === id))
  if (missing.length > 0) throw new AlarmsNotFound(missing)
  return rows
}

/**
 * Acknowledges one or many alarms in one transaction: all or none. A repeated request with the
 * same requestId (a client retrying after a lost answer) is answered from what the first stored,
 * so an acknowledgement is never lost and never applied twice; the same requestId from another
 * user or for other alarms is not a retry and is refused (409).
 */
export async function acknowledgeAlarms(db: Db, input: { ids: number[], comment?: string, requestId?: string }, ctx: ChangeContext) {
  return db.transaction(async (tx) => {
    if (input.requestId) {
      const done = await tx.select({ alarmId: alarmEvents.alarmId, userId: alarmEvents.userId }).from(alarmEvents)
        .where(and(eq(alarmEvents.requestId, input.requestId), eq(alarmEvents.event, 'acknowledge')))
      if (done.length > 0) {
        const sameAlarms = done.length === input.ids.length && done.every(d => input.ids.includes(d.alarmId))
        if (!sameAlarms || done.some(d => d.userId !== ctx.userId)) throw new RequestIdReused()
        return { replayed: true, alarms: await tx.select().from(alarms).where(inArray(alarms.id, done.map(d => d.alarmId))) }
      }
    }
    const locked = await lockAlarms(tx, input.ids)
    // All or none: the lifecycle decides which may be acknowledged, and every refusal is named at once.
    const refusals = locked.flatMap((a) => {
      const step = applyLifecycleEvent(a, 'acknowledge')
      return step.ok ? [] : [{ alarmId: a.id, state: a.state, label: alarmLabel(a), reason: step.reason }]
    })
    if (refusals.length > 0) throw new AlarmTransitionRefused(refusals)
    const updated: AlarmRow[] = []
    for (const alarm of locked) updated.push(await transitionAlarm(tx, alarm, 'acknowledge', ctx, { comment: input.comment, requestId: input.requestId }))
    return { replayed: false, alarms: updated }
  })
}

export async function shelveAlarm(db: Db, id: number, input: { reason: string, minutes: number }, ctx: ChangeContext) {
  return db.transaction(async (tx) => {
    const [alarm] = await lockAlarms(tx, [id])
    if (alarm!.state === 'normal') {
      throw new AlarmTransitionRefused([{ alarmId: id, state: alarm!.state, label: alarmLabel(alarm!), reason: 'this occurrence is closed; shelve an active alarm' }])
    }
    const until = new Date(Date.now() + input.minutes * 60_000)
    return transitionAlarm(tx, alarm!, 'shelve', ctx, { comment: input.reason, shelve: { until, reason: input.reason } })
  })
}

export async function unshelveAlarm(db: Db, id: number, comment: string | undefined, ctx: ChangeContext) {
  return db.transaction(async (tx) => {
    const [alarm] = await lockAlarms(tx, [id])
    return transitionAlarm(tx, alarm!, 'unshelve', ctx, { comment: comment ?? '' })
  })
}

/** Ends every shelve whose time is up (ISA-18.2: shelving is time-limited). Returns how many. */
export async function expireShelves(db: Db, ctx: Omit<ChangeContext, 'userId'>): Promise<number> {
  return db.transaction(async (tx) => {
    const due = await tx.select().from(alarms)
      .where(and(eq(alarms.state, 'shelved'), lte(alarms.shelvedUntil, new Date())))
      .orderBy(asc(alarms.id)).for('update', { skipLocked: true })
    for (const alarm of due) await transitionAlarm(tx, alarm, 'unshelve', { ...ctx, userId: null }, { comment: 'shelve expired' })
    return due.length
  })
}
