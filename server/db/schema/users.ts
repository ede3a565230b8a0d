import { pgEnum, pgTable, serial, text, timestamp, boolean, index } from 'drizzle-orm/pg-core'

export const roleEnum = pgEnum('role', ['operator', 'engineer', 'supervisor', 'admin'])

export const users = pgTable('users', {
  id: serial('id').primaryKey(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  role: roleEnum('role').notNull(),
  passwordHash: text('password_hash').notNull(),
  active: boolean('active').notNull().default(true),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  lastSignInAt: timestamp('last_sign_in_at', { withTimezone: true }),
})

// Failed sign-ins, kept in the database (not in memory) so the limit holds across several
// server instances and restarts.
export const signInFailures = pgTable('sign_in_failures', {
  id: serial('id').primaryKey(),
  email: text('email').notNull(),
  address: text('address').notNull(),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
}, t => [index('sign_in_failures_email_at').on(t.email, t.at), index('sign_in_failures_address_at').on(t.address, t.at)])

// Sessions are sealed cookies: signing out clears the browser's copy, and this list makes any
// other copy of that cookie useless too. Rows older than the session lifetime can go.
export const revokedSessions = pgTable('revoked_sessions', {
  sessionId: text('session_id').primaryKey(),
  revokedAt: timestamp('revoked_at', { withTimezone: true }).notNull().defaultNow(),
})
