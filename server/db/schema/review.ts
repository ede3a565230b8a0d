import { sql } from 'drizzle-orm'
import { pgTable, bigserial, bigint, integer, text, doublePrecision, timestamp, index, check } from 'drizzle-orm/pg-core'
import { ALERT_OUTCOMES, DEFAULT_INCIDENT_WINDOW_S, INCIDENT_ORIGINS, INCIDENT_STATES, MAX_INCIDENT_WINDOW_S } from '../../../shared/alarms/reviewVocabulary'
import type { AlertOutcome, IncidentOrigin, IncidentState } from '../../../shared/alarms/reviewVocabulary'
import { oneOf } from './checks'
import { alarms } from './alarms'
import { sites, units } from './plant'
import { users } from './users'

// Per-site settings of the supervisor's review. A site without a row uses the defaults.
export const siteReviewSettings = pgTable('site_review_settings', {
  siteId: integer('site_id').primaryKey().references(() => sites.id, { onDelete: 'cascade' }),
  /** Alarms on one unit raised within this many seconds of the incident's last activity join it. */
  incidentWindowS: doublePrecision('incident_window_s').notNull().default(DEFAULT_INCIDENT_WINDOW_S),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  updatedBy: integer('updated_by').references(() => users.id, { onDelete: 'set null' }),
}, t => [
  check('site_review_settings_window', sql`${t.incidentWindowS} > 0 and ${t.incidentWindowS} <= ${sql.raw(String(MAX_INCIDENT_WINDOW_S))}`),
])

// Alarms and alerts on one unit that belong together, with the supervisor's findings and sign-off.
// The early-warning summary (first slowing-down alert, first limit alarm, lead between them) is
// recomputed in the same transaction whenever the incident's alarms change.
export const incidents = pgTable('incidents', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  unitId: integer('unit_id').notNull().references(() => units.id, { onDelete: 'cascade' }),
  title: text('title').notNull().default(''),
  state: text('state').$type<IncidentState>().notNull().default('open'),
  origin: text('origin').$type<IncidentOrigin>().notNull(),
  earlyWarningAt: timestamp('early_warning_at', { withTimezone: true }),
  limitAlarmAt: timestamp('limit_alarm_at', { withTimezone: true }),
  /** Seconds from the first slowing-down alert to the first limit alarm (negative: the alert came later). */
  leadTimeS: doublePrecision('lead_time_s'),
  whatHappened: text('what_happened').notNull().default(''),
  cause: text('cause').notNull().default(''),
  actions: text('actions').notNull().default(''),
  lessons: text('lessons').notNull().default(''),
  signedOffAt: timestamp('signed_off_at', { withTimezone: true }),
  signedOffBy: integer('signed_off_by').references(() => users.id, { onDelete: 'set null' }),
  /** The name as signed, kept even if the account is later removed. */
  signedOffByName: text('signed_off_by_name'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
}, t => [
  index('incidents_site_state').on(t.siteId, t.state),
  index('incidents_unit').on(t.unitId),
  check('incidents_state', oneOf(t.state, INCIDENT_STATES)),
  check('incidents_origin', oneOf(t.origin, INCIDENT_ORIGINS)),
  check('incidents_signed_off', sql`${t.state} <> 'closed' or (${t.signedOffAt} is not null and ${t.signedOffByName} is not null)`),
])

// Which incident an alarm occurrence belongs to: at most one.
export const incidentAlarms = pgTable('incident_alarms', {
  alarmId: bigint('alarm_id', { mode: 'number' }).primaryKey().references(() => alarms.id, { onDelete: 'cascade' }),
  incidentId: bigint('incident_id', { mode: 'number' }).notNull().references(() => incidents.id, { onDelete: 'cascade' }),
  addedAt: timestamp('added_at', { withTimezone: true }).notNull().defaultNow(),
  /** null: grouped automatically. */
  addedBy: integer('added_by').references(() => users.id, { onDelete: 'set null' }),
}, t => [index('incident_alarms_incident').on(t.incidentId)])

// The supervisor's verdict on an early-warning alert no limit alarm followed.
export const alertOutcomes = pgTable('alert_outcomes', {
  alarmId: bigint('alarm_id', { mode: 'number' }).primaryKey().references(() => alarms.id, { onDelete: 'cascade' }),
  outcome: text('outcome').$type<AlertOutcome>().notNull(),
  note: text('note').notNull().default(''),
  markedBy: integer('marked_by').references(() => users.id, { onDelete: 'set null' }),
  markedAt: timestamp('marked_at', { withTimezone: true }).notNull().defaultNow(),
}, t => [check('alert_outcomes_outcome', oneOf(t.outcome, ALERT_OUTCOMES))])
