import { sql } from 'drizzle-orm'
import { pgEnum, pgTable, serial, integer, text, timestamp, boolean, index, check } from 'drizzle-orm/pg-core'
import { ROLES } from '../../../shared/utils/roles'

export const roleEnum = pgEnum('role', ROLES)

export const users = pgTable('users', {
  id: serial('id').primaryKey(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  role: roleEnum('role').notNull(),
  /** Null until the user follows the set-password link of their invitation. */
  passwordHash: text('password_hash'),
  active: boolean('active').notNull().default(true),
  /** Sessions signed in before this instant are refused (end all sessions, role change, disable). */
  sessionsValidAfter: timestamp('sessions_valid_after', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  lastSignInAt: timestamp('last_sign_in_at', { withTimezone: true }),
})

// Sessions are sealed cookies: signing out clears the browser's copy, and this list makes any
// other copy of that cookie useless too. Rows older than the session lifetime can go.
export const revokedSessions = pgTable('revoked_sessions', {
  sessionId: text('session_id').primaryKey(),
  revokedAt: timestamp('revoked_at', { withTimezone: true }).notNull().defaultNow(),
})

// One-time links to set a password (invitation) or choose a new one (reset). Only a SHA-256 digest
// of the 256-bit token is kept; a link works once (used_at) and until expires_at.
export const passwordTokens = pgTable('password_tokens', {
  id: serial('id').primaryKey(),
  userId: integer('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text('token_hash').notNull().unique(),
  purpose: text('purpose').notNull(),
  createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
}, t => [
  index('password_tokens_user').on(t.userId),
  check('password_tokens_purpose', sql`${t.purpose} in ('invite', 'reset')`),
])
