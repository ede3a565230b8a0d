import { sql } from 'drizzle-orm'
import { pgTable, serial, text, integer, doublePrecision, timestamp, unique, boolean, check, type AnyPgColumn } from 'drizzle-orm/pg-core'
import { LOOP_ROLES, type LoopRole } from '../../../shared/plant/vocabulary'
import { RAW_RETENTION_DAYS } from '../../../shared/schemas/storage'
import { oneOf } from './checks'

export const sites = pgTable('sites', {
  id: serial('id').primaryKey(),
  code: text('code').notNull().unique(),
  name: text('name').notNull(),
  company: text('company').notNull(),
  // IANA zone: times are stored in UTC and shown in the plant's local time.
  timeZone: text('time_zone').notNull().default('UTC'),
  // Days raw samples are kept before the storage job folds them into the per-minute archive;
  // null keeps them indefinitely (an upgrade never starts deleting history on its own).
  rawRetentionDays: integer('raw_retention_days'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  // Retired rows stay with their history and can be restored; nothing in the plant model is deleted.
  retiredAt: timestamp('retired_at', { withTimezone: true }),
}, t => [
  check('sites_raw_retention_days', sql`${t.rawRetentionDays} is null or ${t.rawRetentionDays} between ${sql.raw(String(RAW_RETENTION_DAYS.min))} and ${sql.raw(String(RAW_RETENTION_DAYS.max))}`),
])

export const units = pgTable('units', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  code: text('code').notNull(),
  name: text('name').notNull(),
  kind: text('kind').notNull(),
  description: text('description').notNull().default(''),
  retiredAt: timestamp('retired_at', { withTimezone: true }),
}, t => [unique('units_site_code').on(t.siteId, t.code)])

export const tags = pgTable('tags', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  unitId: integer('unit_id').notNull().references(() => units.id, { onDelete: 'cascade' }),
  // ISA-5.1 style code, unique within the site (e.g. TI-101).
  code: text('code').notNull(),
  description: text('description').notNull(),
  engineeringUnit: text('engineering_unit').notNull(),
  samplePeriodS: doublePrecision('sample_period_s').notNull(),
  rangeLow: doublePrecision('range_low').notNull(),
  rangeHigh: doublePrecision('range_high').notNull(),
  noiseFloor: doublePrecision('noise_floor').notNull().default(0),
  /** Smallest change the source reports (0: not quantised). */
  quantisationStep: doublePrecision('quantisation_step').notNull().default(0),
  watched: boolean('watched').notNull().default(true),
  /** Set when retired: the pipeline stops watching the tag; samples, points and alarms stay. */
  retiredAt: timestamp('retired_at', { withTimezone: true }),
  /** The tag whose control loop this one belongs to, and as what (controller output or setpoint). */
  loopTagId: integer('loop_tag_id').references((): AnyPgColumn => tags.id, { onDelete: 'set null' }),
  loopRole: text('loop_role').$type<LoopRole>(),
}, t => [
  unique('tags_site_code').on(t.siteId, t.code),
  check('tags_loop_role', oneOf(t.loopRole, LOOP_ROLES)),
  check('tags_loop_link', sql`(${t.loopTagId} is null) = (${t.loopRole} is null) and ${t.loopTagId} <> ${t.id}`),
  check('tags_range', sql`${t.rangeLow} < ${t.rangeHigh} and ${t.samplePeriodS} > 0 and ${t.noiseFloor} >= 0 and ${t.quantisationStep} >= 0`),
])
