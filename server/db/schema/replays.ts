import { sql } from 'drizzle-orm'
import { pgTable, serial, integer, doublePrecision, timestamp, text, jsonb, boolean, index, check } from 'drizzle-orm/pg-core'
import { REPLAY_STATES, type ReplayState } from '../../../shared/alarms/vocabulary'
import type { IndicatorSettings } from '../../../shared/pipeline/indicatorDefaults'
import type { ReplayResult, ReplayRule } from '../../../shared/pipeline/replayOutcome'
import { oneOf } from './checks'
import { sites, tags } from './plant'
import { users } from './users'

// A replay of a tag's stored history through the live engine and rules (issue 14 item 4). The
// settings and rules it ran with are copied onto the row when it is asked for, so the saved
// report keeps saying what it replayed after the tag's settings or rules change.
export const replays = pgTable('replays', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }),
  fromTime: timestamp('from_time', { withTimezone: true }).notNull(),
  toTime: timestamp('to_time', { withTimezone: true }).notNull(),
  /** A known event in the range (trip, runaway, collapse) the lead time is measured to. */
  eventTime: timestamp('event_time', { withTimezone: true }),
  /** How long before the event an activation counts as its warning rather than a false alarm. */
  warningWindowS: doublePrecision('warning_window_s').notNull(),
  note: text('note').notNull().default(''),
  /** true: the engineer's alternative settings; false: the tag's own at the time of asking. */
  alternativeSettings: boolean('alternative_settings').notNull().default(false),
  settings: jsonb('settings').$type<IndicatorSettings>().notNull(),
  rules: jsonb('rules').$type<ReplayRule[]>().notNull(),
  state: text('state').$type<ReplayState>().notNull().default('queued'),
  /** Share of the range's samples evaluated, 0 to 1. */
  progress: doublePrecision('progress').notNull().default(0),
  samplesTotal: integer('samples_total'),
  samplesDone: integer('samples_done').notNull().default(0),
  result: jsonb('result').$type<ReplayResult>(),
  error: text('error'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
  startedAt: timestamp('started_at', { withTimezone: true }),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
}, t => [
  index('replays_created').on(t.createdAt),
  check('replays_state', oneOf(t.state, REPLAY_STATES)),
  check('replays_range', sql`${t.fromTime} < ${t.toTime}`),
  check('replays_progress', sql`${t.progress} >= 0 and ${t.progress} <= 1`),
  check('replays_warning_window', sql`${t.warningWindowS} > 0`),
])

export type ReplayRow = typeof replays.$inferSelect
