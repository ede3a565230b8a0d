import { pgTable, bigserial, integer, text, timestamp, jsonb, index } from 'drizzle-orm/pg-core'
import { users } from './users'

// Append-only record of every configuration change and security event: a trigger refuses UPDATE,
// DELETE and TRUNCATE (drizzle/0011_administration.sql), whoever asks.
export const auditLog = pgTable('audit_log', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
  action: text('action').notNull(),
  target: text('target').notNull().default(''),
  detail: jsonb('detail').notNull().default({}),
  address: text('address').notNull().default(''),
}, t => [index('audit_log_at').on(t.at), index('audit_log_user_at').on(t.userId, t.at), index('audit_log_action_at').on(t.action, t.at)])
