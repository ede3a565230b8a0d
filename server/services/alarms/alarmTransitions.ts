import { and, eq, ne } from 'drizzle-orm'
import { applyLifecycleEvent } from '#shared/alarms/lifecycle'
import type { AlarmState, LifecycleEvent, RuleMode } from '#shared/alarms/vocabulary'
import { DEFAULT_NOTIFY_MAX_AGE_MINUTES, isFromOldHistory } from '#shared/alarms/historyNotice'
import { historyNoticeComment } from '#shared/notifications/historySummaryMail'
import { alarmEvents, alarms } from '../../db/schema'
import type { AlarmRow, AlarmRuleRow } from '../../db/schema'
import type { ChangeContext } from '../../utils/changeContext'
import type { DbTransaction } from '../../utils/db'
import { AlarmTransitionRefused } from './alarmErrors'
import { addToHistorySummary } from './historySummary'
import { enqueueAlarmMail } from '../mail/alarmNotifications'

export interface TransitionOptions {
  comment?: string
  /** Process time the change refers to (the sample that completed or cleared the condition). */
  conditionTime?: Date
  value?: number | null
  requestId?: string
  shelve?: { until: Date, reason: string }
  /** On an activation: the trend and fold facts at that moment (stored on the alarm and its event). */
  context?: Record<string, unknown>
}

const actorOf = (ctx: ChangeContext) => (ctx.userId === null ? 'system' : `user:${ctx.userId}`)

/** A short name of the alarm for error messages: rule name and tag. */
export const alarmLabel = (alarm: Pick<AlarmRow, 'measure' | 'comparison' | 'threshold'>) =>
  `${alarm.measure} ${alarm.comparison} ${alarm.threshold}`

/**
 * Applies one lifecycle event to a locked alarm row: the pure state machine decides, this stores
 * the new state and appends the alarm event, and an annunciation writes its mail to the outbox —
 * all in the caller's transaction. A refused event throws AlarmTransitionRefused.
 */
export async function transitionAlarm(
  tx: DbTransaction, alarm: AlarmRow, event: LifecycleEvent, ctx: ChangeContext, options: TransitionOptions = {},
): Promise<AlarmRow> {
  const t = applyLifecycleEvent({ state: alarm.state as AlarmState, conditionActive: alarm.conditionActive }, event)
  if (!t.ok) throw new AlarmTransitionRefused([{ alarmId: alarm.id, state: alarm.state, label: alarmLabel(alarm), reason: t.reason }])
  const now = new Date()
  // An annunciating activation from back-filled or uploaded samples hours old (docs/design.md §D4 item 5).
  const maxAge = ctx.notifyMaxAgeMinutes ?? DEFAULT_NOTIFY_MAX_AGE_MINUTES
  const fromOldHistory = t.annunciates && event === 'activate' && options.conditionTime !== undefined
    && isFromOldHistory(options.conditionTime.getTime(), now.getTime(), maxAge)
  const set: Partial<typeof alarms.$inferInsert> = { state: t.to.state, conditionActive: t.to.conditionActive, updatedAt: now }
  if (event === 'acknowledge') Object.assign(set, { ackedAt: now, ackedBy: ctx.userId })
  if (event === 'return') set.clearedAt = options.conditionTime ?? now
  // Every activation of the occurrence (the first, and each re-activation after a return or
  // while set aside) becomes its latest: lists, tiles and mail speak of it, not of the first.
  if (event === 'activate') {
    Object.assign(set, {
      activatedAt: options.conditionTime ?? now, activatedValue: options.value ?? null, activationCount: alarm.activationCount + 1,
    })
    if (options.context) set.context = options.context
  }
  // A new annunciation needs a new acknowledgement.
  if (t.annunciates) Object.assign(set, { ackedAt: null, ackedBy: null, clearedAt: null })
  if (t.closes) set.closedAt = now
  if (event === 'shelve' && options.shelve) Object.assign(set, { shelvedUntil: options.shelve.until, shelveReason: options.shelve.reason })
  if (alarm.state === 'shelved' && t.to.state !== 'shelved') Object.assign(set, { shelvedUntil: null, shelveReason: null })
  if (options.value !== undefined && options.value !== null)
    Object.assign(set, { lastValue: options.value, lastValueAt: options.conditionTime ?? now })
  const [updated] = await tx.update(alarms).set(set).where(eq(alarms.id, alarm.id)).returning()
  await tx.insert(alarmEvents).values({
    alarmId: alarm.id,
    at: now,
    conditionTime: options.conditionTime ?? null,
    event,
    fromState: alarm.state,
    toState: t.to.state,
    actor: actorOf(ctx),
    userId: ctx.userId,
    comment: options.comment ?? (fromOldHistory ? historyNoticeComment((now.getTime() - options.conditionTime!.getTime()) / 1000) : ''),
    value: options.value ?? null,
    context: event === 'activate' ? options.context ?? null : null,
    requestId: options.requestId ?? null,
  })
  if (fromOldHistory) await addToHistorySummary(tx, updated!)
  else if (t.annunciates) await enqueueAlarmMail(tx, updated!, ctx.publicUrl, maxAge)
  return updated!
}

const ENTER_MODE: Record<Exclude<RuleMode, 'in_service'>, LifecycleEvent> = { suppressed: 'suppress', out_of_service: 'remove_from_service' }
const EXIT_STATE: Partial<Record<AlarmState, LifecycleEvent>> = { suppressed: 'unsuppress', out_of_service: 'return_to_service' }

/** The event that brings an alarm in line with its rule's mode, or null when it already is. */
export function modeEvent(state: AlarmState, mode: RuleMode): LifecycleEvent | null {
  if (mode === 'in_service') return EXIT_STATE[state] ?? null
  return state === mode ? null : ENTER_MODE[mode]
}

/**
 * A rule's condition became active with no open occurrence: a new alarm row starts at normal and
 * is activated (annunciated, unless the rule is suppressed or out of service, which it records).
 */
export async function raiseAlarm(tx: DbTransaction, rule: AlarmRuleRow, input: {
  time: Date
  value: number
  context: Record<string, unknown>
}, ctx: ChangeContext): Promise<AlarmRow> {
  const [row] = await tx.insert(alarms).values({
    ruleId: rule.id, siteId: rule.siteId, unitId: rule.unitId, tagId: rule.tagId,
    priority: rule.priority, alarmClass: rule.alarmClass, measure: rule.measure, comparison: rule.comparison,
    threshold: rule.threshold, state: 'normal', conditionActive: false, raisedAt: input.time, raisedValue: input.value,
    // Counted up to 1 by the activation below.
    activatedAt: input.time, activatedValue: input.value, activationCount: 0,
    context: input.context,
  }).returning()
  let alarm = row!
  const enter = modeEvent('normal', rule.mode as RuleMode)
  if (enter) alarm = await transitionAlarm(tx, alarm, enter, ctx, { comment: `rule is ${rule.mode.replace(/_/g, ' ')}` })
  return transitionAlarm(tx, alarm, 'activate', ctx, { conditionTime: input.time, value: input.value, context: input.context })
}

/** The rule's open occurrence, locked for this transaction. */
export async function lockOpenAlarm(tx: DbTransaction, ruleId: number): Promise<AlarmRow | undefined> {
  const [row] = await tx.select().from(alarms).where(and(eq(alarms.ruleId, ruleId), ne(alarms.state, 'normal'))).for('update')
  return row
}
