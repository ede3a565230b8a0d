import { pgTable, integer, doublePrecision, timestamp, smallint, primaryKey, bigint, bigserial } from 'drizzle-orm/pg-core'
import { tags } from './plant'

// The big table: tens of millions of rows. Narrow rows (int, timestamptz, float8, int2) and the
// primary key (tag_id, time) serve the only hot access path, "one tag, a time range", and make
// ingest idempotent (ON CONFLICT DO NOTHING). No surrogate id, no extra indexes.
// quality: 0 good, 1 uncertain, 2 bad (see shared/utils/quality.ts).
// Partitioned by time, one partition per UTC day, with a default partition for the rest
// (migration 0020; drizzle-kit cannot declare partitioning, so the table is declared plain here).
// The key includes the partition key (time), as PostgreSQL requires of a unique key on a
// partitioned table. server/services/storage/ owns the partitions.
export const samples = pgTable('samples', {
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }),
  time: timestamp('time', { withTimezone: true, mode: 'date' }).notNull(),
  value: doublePrecision('value').notNull(),
  quality: smallint('quality').notNull().default(0),
}, t => [primaryKey({ columns: [t.tagId, t.time] })])

// The per-minute archive raw samples are folded into once they are older than their site's raw
// window: min, mean and max of the good and uncertain readings, and how many of each kind there
// were, so a trend older than the window can still be drawn and no reading vanishes uncounted.
// Partitioned by time, one partition per UTC month (migration 0020).
export const samplesMinute = pgTable('samples_minute', {
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }),
  minute: timestamp('minute', { withTimezone: true, mode: 'date' }).notNull(),
  valueMin: doublePrecision('value_min'),
  valueMean: doublePrecision('value_mean'),
  valueMax: doublePrecision('value_max'),
  /** Good and uncertain readings behind min/mean/max. */
  samples: integer('samples').notNull(),
  /** Bad-quality readings of the minute: counted, never part of the figures. */
  badSamples: integer('bad_samples').notNull(),
}, t => [primaryKey({ columns: [t.tagId, t.minute] })])

// One row per storage job run: the admin's growth chart and the projection read these.
export const storageSnapshots = pgTable('storage_snapshots', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  takenAt: timestamp('taken_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  databaseBytes: bigint('database_bytes', { mode: 'number' }).notNull(),
  sampleRows: bigint('sample_rows', { mode: 'number' }).notNull(),
  archiveRows: bigint('archive_rows', { mode: 'number' }).notNull(),
})
