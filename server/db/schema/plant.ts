import { pgTable, serial, text, integer, doublePrecision, timestamp, unique, boolean } from 'drizzle-orm/pg-core'

export const sites = pgTable('sites', {
  id: serial('id').primaryKey(),
  code: text('code').notNull().unique(),
  name: text('name').notNull(),
  company: text('company').notNull(),
  // IANA zone: times are stored in UTC and shown in the plant's local time.
  timeZone: text('time_zone').notNull().default('UTC'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
})

export const units = pgTable('units', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  code: text('code').notNull(),
  name: text('name').notNull(),
  kind: text('kind').notNull(),
  description: text('description').notNull().default(''),
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
  watched: boolean('watched').notNull().default(true),
}, t => [unique('tags_site_code').on(t.siteId, t.code)])
