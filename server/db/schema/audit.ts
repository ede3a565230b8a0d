import { pgTable, bigserial, integer, text, timestamp, jsonb, index } from 'drizzle-orm/pg-core'
import { users } from './users'

// Append-only record of every configuration change and security event.
export const auditLog = pgTable('audit_log', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
  action: text('action').notNull(),
  target: text('target').notNull().default(''),
  detail: jsonb('detail').notNull().default({}),
  address: text('address').notNull().default(''),
}, t => [index('audit_log_at').on(t.at)])
