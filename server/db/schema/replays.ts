import { sql } from 'drizzle-orm'
import { pgTable, serial, integer, doublePrecision, timestamp, text, jsonb, boolean, index, check, smallint, primaryKey } from 'drizzle-orm/pg-core'
import { REPLAY_SOURCES, REPLAY_STATES, type ReplaySource, type ReplayState } from '../../../shared/alarms/vocabulary'
import type { IndicatorSettings } from '../../../shared/pipeline/indicatorDefaults'
import type { ReplayResult, ReplayRule } from '../../../shared/pipeline/replayOutcome'
import type { SettingsInForce } from '../../../shared/pipeline/settingsInForce'
import { oneOf } from './checks'
import { sites, tags, units } from './plant'
import { users } from './users'

// A replay of a tag's stored history (or a file) through the live engine and rules, or of a unit's
// recorded slow-mode fits through its unit rules (issue 14 item 4). The
// settings and rules it ran with are copied onto the row when it is asked for, so the saved
// report keeps saying what it replayed after the tag's settings or rules change.
export const replays = pgTable('replays', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  /** The tag replayed; null for a unit's replay (its slow-mode rules). */
  tagId: integer('tag_id').references(() => tags.id, { onDelete: 'cascade' }),
  unitId: integer('unit_id').references(() => units.id, { onDelete: 'cascade' }),
  fromTime: timestamp('from_time', { withTimezone: true }).notNull(),
  toTime: timestamp('to_time', { withTimezone: true }).notNull(),
  /** A known event in the range (trip, runaway, collapse) the lead time is measured to. */
  eventTime: timestamp('event_time', { withTimezone: true }),
  /** How long before the event an activation counts as its warning rather than a false alarm. */
  warningWindowS: doublePrecision('warning_window_s').notNull(),
  note: text('note').notNull().default(''),
  /** true: the engineer's alternative settings; false: the tag's own at the time of asking. */
  alternativeSettings: boolean('alternative_settings').notNull().default(false),
  /** null for a unit's replay, which replays the slow-mode fits the live task recorded. */
  settings: jsonb('settings').$type<IndicatorSettings>(),
  /**
   * The tag's own settings versions over the range, oldest first (null: `settings` throughout, as
   * for alternative settings and uploaded files). The first is in force from the start of the data.
   */
  settingsInForce: jsonb('settings_in_force').$type<SettingsInForce[]>(),
  /** Where the samples come from: the tag's stored history, or a file uploaded for this replay (replay_samples). */
  source: text('source').$type<ReplaySource>().notNull().default('history'),
  /** The pg-boss job working it, so a replay whose job gave up can be told from one still waiting. */
  jobId: text('job_id'),
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
  check('replays_source', oneOf(t.source, REPLAY_SOURCES)),
  check('replays_target', sql`(${t.tagId} is null) <> (${t.unitId} is null) and (${t.tagId} is null or ${t.settings} is not null)`),
  check('replays_range', sql`${t.fromTime} < ${t.toTime}`),
  check('replays_progress', sql`${t.progress} >= 0 and ${t.progress} <= 1`),
  check('replays_warning_window', sql`${t.warningWindowS} > 0`),
])

export type ReplayRow = typeof replays.$inferSelect

// The samples of a historian file uploaded for one replay: kept apart from the plant's history,
// which a replay never changes, and removed with the replay.
export const replaySamples = pgTable('replay_samples', {
  replayId: integer('replay_id').notNull().references(() => replays.id, { onDelete: 'cascade' }),
  time: timestamp('time', { withTimezone: true, mode: 'date' }).notNull(),
  value: doublePrecision('value').notNull(),
  quality: smallint('quality').notNull().default(0),
}, t => [primaryKey({ columns: [t.replayId, t.time] })])
