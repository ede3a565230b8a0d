import { sql } from 'drizzle-orm'
import { pgTable, serial, bigserial, bigint, integer, text, doublePrecision, timestamp, boolean, jsonb, index, uniqueIndex, check } from 'drizzle-orm/pg-core'
import { ALARM_CLASSES, ALARM_STATES, COMPARISONS, PRIORITIES, RULE_MODES, TAG_MEASURES, TARGET_KINDS } from '../../../shared/alarms/vocabulary'
import type { AlarmClass, AlarmState, Comparison, Priority, RuleMode, TagMeasure, TargetKind } from '../../../shared/alarms/vocabulary'
import { oneOf } from './checks'
import { sites, tags, units } from './plant'
import { users } from './users'

// The master alarm database: what is watched, when it alarms, and the rationale every alarm
// needs (ISA-18.2 rationalization: consequence, cause, operator action).
export const alarmRules = pgTable('alarm_rules', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  targetKind: text('target_kind').$type<TargetKind>().notNull(),
  tagId: integer('tag_id').references(() => tags.id, { onDelete: 'cascade' }),
  unitId: integer('unit_id').notNull().references(() => units.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  measure: text('measure').$type<TagMeasure>().notNull(),
  comparison: text('comparison').$type<Comparison>().notNull(),
  threshold: doublePrecision('threshold').notNull(),
  onDelayS: doublePrecision('on_delay_s').notNull().default(0),
  offDelayS: doublePrecision('off_delay_s').notNull().default(0),
  deadband: doublePrecision('deadband').notNull().default(0),
  priority: text('priority').$type<Priority>().notNull(),
  alarmClass: text('class').$type<AlarmClass>().notNull(),
  consequence: text('consequence').notNull(),
  likelyCause: text('likely_cause').notNull(),
  operatorAction: text('operator_action').notNull(),
  /** ISA-18.2 rationalization: the time the operator has to act (null on rules written before it was asked). */
  timeToRespondS: doublePrecision('time_to_respond_s'),
  mode: text('mode').$type<RuleMode>().notNull().default('in_service'),
  enabled: boolean('enabled').notNull().default(true),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  updatedBy: integer('updated_by').references(() => users.id, { onDelete: 'set null' }),
}, t => [
  index('alarm_rules_tag').on(t.tagId),
  index('alarm_rules_unit').on(t.unitId),
  uniqueIndex('alarm_rules_site_name').on(t.siteId, t.name),
  check('alarm_rules_target', sql`(${t.targetKind} = 'tag' and ${t.tagId} is not null) or (${t.targetKind} = 'unit' and ${t.tagId} is null)`),
  check('alarm_rules_target_kind', oneOf(t.targetKind, TARGET_KINDS)),
  check('alarm_rules_measure', oneOf(t.measure, TAG_MEASURES)),
  check('alarm_rules_comparison', oneOf(t.comparison, COMPARISONS)),
  check('alarm_rules_priority', oneOf(t.priority, PRIORITIES)),
  check('alarm_rules_class', oneOf(t.alarmClass, ALARM_CLASSES)),
  check('alarm_rules_mode', oneOf(t.mode, RULE_MODES)),
  check('alarm_rules_delays', sql`${t.onDelayS} >= 0 and ${t.offDelayS} >= 0 and ${t.deadband} >= 0`),
  check('alarm_rules_time_to_respond', sql`${t.timeToRespondS} is null or ${t.timeToRespondS} > 0`),
  check('alarm_rules_rationale', sql`length(${t.consequence}) > 0 and length(${t.likelyCause}) > 0 and length(${t.operatorAction}) > 0`),
])

// The condition tracker of each rule (on-delay, off-delay, deadband), advanced by the pipeline.
export const alarmRuleStates = pgTable('alarm_rule_states', {
  ruleId: integer('rule_id').primaryKey().references(() => alarmRules.id, { onDelete: 'cascade' }),
  active: boolean('active').notNull().default(false),
  pendingSince: timestamp('pending_since', { withTimezone: true }),
  clearingSince: timestamp('clearing_since', { withTimezone: true }),
  lastValue: doublePrecision('last_value'),
  lastTime: timestamp('last_time', { withTimezone: true }),
})

// One row per alarm occurrence, from activation until it is back to normal (state 'normal').
// A rule has at most one open occurrence (the partial unique index).
export const alarms = pgTable('alarms', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  ruleId: integer('rule_id').notNull().references(() => alarmRules.id, { onDelete: 'restrict' }),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  unitId: integer('unit_id').notNull().references(() => units.id, { onDelete: 'cascade' }),
  tagId: integer('tag_id').references(() => tags.id, { onDelete: 'cascade' }),
  // Snapshots of the rule at activation: a later edit does not rewrite history.
  priority: text('priority').$type<Priority>().notNull(),
  alarmClass: text('class').$type<AlarmClass>().notNull(),
  measure: text('measure').$type<TagMeasure>().notNull(),
  comparison: text('comparison').$type<Comparison>().notNull(),
  threshold: doublePrecision('threshold').notNull(),
  state: text('state').$type<AlarmState>().notNull(),
  /** Whether the alarm condition currently holds (tracked through shelving and suppression). */
  conditionActive: boolean('condition_active').notNull(),
  raisedAt: timestamp('raised_at', { withTimezone: true }).notNull(),
  raisedValue: doublePrecision('raised_value'),
  /**
   * The latest activation of this occurrence (the first one until it re-activates from
   * returned-to-normal-unacknowledged or from a set-aside state): lists sort by it and mail
   * states it, so a re-raised alarm reads as new, not hours old.
   */
  activatedAt: timestamp('activated_at', { withTimezone: true }).notNull(),
  activatedValue: doublePrecision('activated_value'),
  /** Activations in this occurrence, the first included. */
  activationCount: integer('activation_count').notNull().default(1),
  ackedAt: timestamp('acked_at', { withTimezone: true }),
  ackedBy: integer('acked_by').references(() => users.id, { onDelete: 'set null' }),
  clearedAt: timestamp('cleared_at', { withTimezone: true }),
  closedAt: timestamp('closed_at', { withTimezone: true }),
  shelvedUntil: timestamp('shelved_until', { withTimezone: true }),
  shelveReason: text('shelve_reason'),
  lastValue: doublePrecision('last_value'),
  lastValueAt: timestamp('last_value_at', { withTimezone: true }),
  /** Trend and fold horizon behind the latest activation, for the message. */
  context: jsonb('context').$type<Record<string, unknown>>().notNull().default({}),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
}, t => [
  uniqueIndex('alarms_one_open_per_rule').on(t.ruleId).where(sql`${t.state} <> 'normal'`),
  index('alarms_open').on(t.state).where(sql`${t.state} <> 'normal'`),
  index('alarms_site_raised').on(t.siteId, t.raisedAt),
  index('alarms_site_activated').on(t.siteId, t.activatedAt),
  index('alarms_shelved_until').on(t.shelvedUntil).where(sql`${t.state} = 'shelved'`),
  check('alarms_state', oneOf(t.state, ALARM_STATES)),
])

export type AlarmRuleRow = typeof alarmRules.$inferSelect
export type AlarmRow = typeof alarms.$inferSelect

// Append-only: every lifecycle transition with who, when and why (a trigger refuses changes).
export const alarmEvents = pgTable('alarm_events', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  alarmId: bigint('alarm_id', { mode: 'number' }).notNull().references(() => alarms.id, { onDelete: 'cascade' }),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  /** The process time the transition refers to (the sample that completed the condition). */
  conditionTime: timestamp('condition_time', { withTimezone: true }),
  event: text('event').notNull(),
  fromState: text('from_state'),
  toState: text('to_state').notNull(),
  /** 'system' or 'user:<id>'. */
  actor: text('actor').notNull(),
  userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
  comment: text('comment').notNull().default(''),
  value: doublePrecision('value'),
  /** On an activation: the trend and fold facts at that moment (each re-activation keeps its own). */
  context: jsonb('context').$type<Record<string, unknown>>(),
  /** A client's request id, so a retried acknowledgement is recognised, not repeated. */
  requestId: text('request_id'),
}, t => [
  index('alarm_events_alarm').on(t.alarmId, t.id),
  index('alarm_events_request').on(t.requestId).where(sql`${t.requestId} is not null`),
])
