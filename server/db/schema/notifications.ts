import { sql } from 'drizzle-orm'
import { pgTable, serial, bigserial, bigint, integer, text, timestamp, boolean, index, uniqueIndex, check } from 'drizzle-orm/pg-core'
import { ALARM_CLASSES, PRIORITIES } from '../../../shared/alarms/vocabulary'
import { oneOf } from './checks'
import { sites, units } from './plant'
import { roleEnum } from './users'

// Who receives which alarm mail: an address or everyone with a role, for a site or one unit,
// from a minimum priority up, for alarms and/or advisory alerts, at once or in the digest,
// always or only in working hours (minutes after local midnight in the site's zone, ISO weekdays).
export const notificationRoutes = pgTable('notification_routes', {
  id: serial('id').primaryKey(),
  name: text('name').notNull().default(''),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  unitId: integer('unit_id').references(() => units.id, { onDelete: 'cascade' }),
  email: text('email'),
  role: roleEnum('role'),
  minPriority: text('min_priority').notNull(),
  alarmClasses: text('alarm_classes').array().notNull().default(sql`'{alarm,alert}'`),
  delivery: text('delivery').notNull().default('immediate'),
  hours: text('hours').notNull().default('always'),
  workStartMinute: integer('work_start_minute').notNull().default(420),
  workEndMinute: integer('work_end_minute').notNull().default(1140),
  workDays: integer('work_days').array().notNull().default(sql`'{1,2,3,4,5}'`),
  enabled: boolean('enabled').notNull().default(true),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, t => [
  check('notification_routes_recipient', sql`(${t.email} is null) <> (${t.role} is null)`),
  check('notification_routes_priority', oneOf(t.minPriority, PRIORITIES)),
  check('notification_routes_classes', sql`${t.alarmClasses} <@ array[${sql.raw(ALARM_CLASSES.map(c => `'${c}'`).join(', '))}]::text[] and cardinality(${t.alarmClasses}) > 0`),
  check('notification_routes_delivery', oneOf(t.delivery, ['immediate', 'digest'])),
  check('notification_routes_hours', oneOf(t.hours, ['always', 'working'])),
  check('notification_routes_work_minutes', sql`${t.workStartMinute} between 0 and 1439 and ${t.workEndMinute} between 0 and 1439 and ${t.workStartMinute} <> ${t.workEndMinute}`),
])

/**
 * A mail per alarm, a flood digest, one summary of alarms raised from old history (docs/design.md
 * §D4), a route's test mail, or an account mail (set-password link).
 */
export const OUTBOX_KINDS = ['alarm', 'digest', 'history_summary', 'test', 'account'] as const
export type OutboxKind = typeof OUTBOX_KINDS[number]

// Mail to send, written in the same transaction as the alarm change that causes it. The sender
// claims rows FOR UPDATE SKIP LOCKED; delivery is at least once (see server/services/mail/mailSender.ts).
export const notificationOutbox = pgTable('notification_outbox', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  kind: text('kind').$type<OutboxKind>().notNull(),
  /** Null for mail about an account (set-password links), which belongs to no site. */
  siteId: integer('site_id').references(() => sites.id, { onDelete: 'cascade' }),
  /** The routes that chose these recipients: each route's delivery log reads its messages by this. */
  routeIds: integer('route_ids').array().notNull().default(sql`'{}'`),
  /** The alarm of a single message; a digest lists its alarms in alarm_ids. */
  alarmId: bigint('alarm_id', { mode: 'number' }),
  alarmIds: bigint('alarm_ids', { mode: 'number' }).array().notNull().default(sql`'{}'`),
  recipients: text('recipients').array().notNull(),
  /** Rendered when written; a digest is rendered when sent, so it lists every alarm it collected. */
  subject: text('subject').notNull().default(''),
  body: text('body').notNull().default(''),
  status: text('status').notNull().default('pending'),
  attempts: integer('attempts').notNull().default(0),
  nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  sentAt: timestamp('sent_at', { withTimezone: true }),
  lastError: text('last_error'),
}, t => [
  check('notification_outbox_kind', oneOf(t.kind, OUTBOX_KINDS)),
  check('notification_outbox_status', oneOf(t.status, ['pending', 'sent', 'failed'])),
  index('notification_outbox_due').on(t.nextAttemptAt).where(sql`${t.status} = 'pending'`),
  index('notification_outbox_routes').using('gin', t.routeIds),
  // One digest collects per site at a time.
  uniqueIndex('notification_outbox_open_digest').on(t.siteId).where(sql`${t.kind} = 'digest' and ${t.status} = 'pending'`),
  // And one summary of alarms raised from old (back-filled or uploaded) history.
  uniqueIndex('notification_outbox_open_history_summary').on(t.siteId).where(sql`${t.kind} = 'history_summary' and ${t.status} = 'pending'`),
])

export const outboxAttempts = pgTable('outbox_attempts', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  outboxId: bigint('outbox_id', { mode: 'number' }).notNull().references(() => notificationOutbox.id, { onDelete: 'cascade' }),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  ok: boolean('ok').notNull(),
  error: text('error'),
  durationMs: integer('duration_ms').notNull(),
}, t => [index('outbox_attempts_outbox').on(t.outboxId)])
