import { sql } from 'drizzle-orm'
import { pgTable, bigserial, bigint, integer, text, timestamp, index, check } from 'drizzle-orm/pg-core'
import { alarms } from './alarms'
import { sites, tags, units } from './plant'
import { users } from './users'

// The shift log: timestamped notes by the people on shift, optionally about a unit, a tag or an
// alarm. `at` is when the noted thing happened (it may be earlier than `created_at`, the moment
// of writing). Append-only in practice: notes are written, never edited, like a paper log.
export const shiftLogNotes = pgTable('shift_log_notes', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
  at: timestamp('at', { withTimezone: true }).notNull(),
  body: text('body').notNull(),
  unitId: integer('unit_id').references(() => units.id, { onDelete: 'set null' }),
  tagId: integer('tag_id').references(() => tags.id, { onDelete: 'set null' }),
  alarmId: bigint('alarm_id', { mode: 'number' }).references(() => alarms.id, { onDelete: 'set null' }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, t => [
  index('shift_log_notes_site_at').on(t.siteId, t.at),
  check('shift_log_notes_body', sql`length(${t.body}) between 1 and 4000`),
])
