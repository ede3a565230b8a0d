import { pgTable, integer, doublePrecision, timestamp, smallint, primaryKey } from 'drizzle-orm/pg-core'
import { tags } from './plant'

// The big table: tens of millions of rows. Narrow rows (int, timestamptz, float8, int2) and the
// primary key (tag_id, time) serve the only hot access path, "one tag, a time range", and make
// ingest idempotent (ON CONFLICT DO NOTHING). No surrogate id, no extra indexes.
// quality: 0 good, 1 uncertain, 2 bad (see shared/utils/quality.ts).
export const samples = pgTable('samples', {
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }),
  time: timestamp('time', { withTimezone: true, mode: 'date' }).notNull(),
  value: doublePrecision('value').notNull(),
  quality: smallint('quality').notNull().default(0),
}, t => [primaryKey({ columns: [t.tagId, t.time] })])
