import { sql } from 'drizzle-orm'
import { pgTable, serial, integer, doublePrecision, timestamp, text, primaryKey, jsonb, check, index, type AnyPgColumn } from 'drizzle-orm/pg-core'
import type { IndicatorSettings } from '../../../shared/pipeline/indicatorDefaults'
import { TAG_STATUSES } from '../../../shared/alarms/vocabulary'
import { oneOf } from './checks'
import { tags, units } from './plant'
import { users } from './users'

// Per-tag settings of the live pipeline. A row is created with defaults derived from the tag's
// sample period the first time the pipeline sees the tag; engineers edit it afterwards.
export const indicatorSettings = pgTable('indicator_settings', {
  tagId: integer('tag_id').primaryKey().references(() => tags.id, { onDelete: 'cascade' }),
  windowSamples: integer('window_samples').notNull(),
  detrendBandwidthS: doublePrecision('detrend_bandwidth_s').notNull(),
  trendWindowSamples: integer('trend_window_samples').notNull(),
  indicatorStep: integer('indicator_step').notNull(),
  evaluateEvery: integer('evaluate_every').notNull(),
  surrogates: integer('surrogates').notNull(),
  alpha: doublePrecision('alpha').notNull(),
  minTrendSamples: integer('min_trend_samples').notNull().default(200),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  updatedBy: integer('updated_by').references(() => users.id, { onDelete: 'set null' }),
  /** The version these values are (null: the pipeline's starting values, never edited). */
  versionId: integer('version_id').references((): AnyPgColumn => indicatorSettingsVersions.id, { onDelete: 'no action' }),
}, t => [
  check('indicator_settings_sizes', sql`${t.windowSamples} >= 20 and ${t.trendWindowSamples} > ${t.windowSamples} and ${t.minTrendSamples} >= 30 and ${t.minTrendSamples} <= ${t.trendWindowSamples} and ${t.indicatorStep} >= 1 and ${t.evaluateEvery} >= 1 and ${t.surrogates} >= 19`),
])

// Every set of indicator settings a tag has had, oldest first; indicator points name the version
// that produced them, so a chart can say which settings it shows. Rows are never changed.
export const indicatorSettingsVersions = pgTable('indicator_settings_versions', {
  id: serial('id').primaryKey(),
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }),
  settings: jsonb('settings').$type<IndicatorSettings>().notNull(),
  /** Why the engineer changed them (free text, may be empty for the recorded starting values). */
  reason: text('reason').notNull().default(''),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
}, t => [index('indicator_settings_versions_tag').on(t.tagId, t.id)])

// The claim row of the scheduled pipeline: workers lock it FOR UPDATE SKIP LOCKED, so several
// server instances share the tags; it moves forward in the same transaction as the results.
export const tagAnalysisState = pgTable('tag_analysis_state', {
  tagId: integer('tag_id').primaryKey().references(() => tags.id, { onDelete: 'cascade' }),
  /** Newest sample already processed (status and value rules). */
  lastSampleTime: timestamp('last_sample_time', { withTimezone: true }),
  /** Newest sample at which the indicators and trend tests were last evaluated. */
  lastEvaluatedTime: timestamp('last_evaluated_time', { withTimezone: true }),
  /** Samples processed since that evaluation (the next one comes every `evaluate_every`). */
  samplesSinceEvaluation: integer('samples_since_evaluation').notNull().default(0),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
})

// One row per evaluation of a tag: the window's indicators, the trend tests and the fold horizon.
export const indicatorPoints = pgTable('indicator_points', {
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }),
  time: timestamp('time', { withTimezone: true }).notNull(),
  /** null when the window passed the quality gate, else why it failed. */
  quality: text('quality'),
  variance: doublePrecision('variance'),
  std: doublePrecision('std'),
  cv: doublePrecision('cv'),
  ar1: doublePrecision('ar1'),
  recoveryRate: doublePrecision('recovery_rate'),
  skewness: doublePrecision('skewness'),
  kurtosis: doublePrecision('kurtosis'),
  tauAr1: doublePrecision('tau_ar1'),
  pAr1: doublePrecision('p_ar1'),
  tauVariance: doublePrecision('tau_variance'),
  pVariance: doublePrecision('p_variance'),
  /** 'slowing down' | 'noise level changed' | 'no trend' (shared/analysis/earlyWarningDecision). */
  evidence: text('evidence'),
  foldSeconds: doublePrecision('fold_seconds'),
  foldLowSeconds: doublePrecision('fold_low_seconds'),
  foldHighSeconds: doublePrecision('fold_high_seconds'),
  /** The settings version that produced the point (null: starting values, or before versioning). */
  settingsVersionId: integer('settings_version_id').references(() => indicatorSettingsVersions.id, { onDelete: 'no action' }),
}, t => [primaryKey({ columns: [t.tagId, t.time] })])

// What the overview shows per tag, kept current by the pipeline.
export const tagStatus = pgTable('tag_status', {
  tagId: integer('tag_id').primaryKey().references(() => tags.id, { onDelete: 'cascade' }),
  status: text('status').notNull(),
  reason: text('reason').notNull().default(''),
  latestValue: doublePrecision('latest_value'),
  latestTime: timestamp('latest_time', { withTimezone: true }),
  leadingIndicator: text('leading_indicator'),
  leadingValue: doublePrecision('leading_value'),
  tau: doublePrecision('tau'),
  pValue: doublePrecision('p_value'),
  foldKind: text('fold_kind').notNull().default('none'),
  foldSeconds: doublePrecision('fold_seconds'),
  foldLowSeconds: doublePrecision('fold_low_seconds'),
  foldHighSeconds: doublePrecision('fold_high_seconds'),
  unackedAlarms: integer('unacked_alarms').notNull().default(0),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
}, t => [
  check('tag_status_status', oneOf(t.status, TAG_STATUSES)),
  check('tag_status_fold_kind', oneOf(t.foldKind, ['projected', 'none'])),
])

// The unit's slow mode over time: slowest joint recovery rate and each tag's share in it.
export const unitSlowMode = pgTable('unit_slow_mode', {
  unitId: integer('unit_id').notNull().references(() => units.id, { onDelete: 'cascade' }),
  time: timestamp('time', { withTimezone: true }).notNull(),
  /** null when the fitted VAR(1) shows no recovery in the window (|μ| ≥ 1). */
  recoveryRate: doublePrecision('recovery_rate'),
  /** { "<tagId>": share } with shares summing to 1. */
  shares: jsonb('shares').$type<Record<string, number>>().notNull(),
}, t => [primaryKey({ columns: [t.unitId, t.time] })])
