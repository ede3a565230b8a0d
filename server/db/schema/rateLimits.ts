import { integer, pgTable, text, timestamp } from 'drizzle-orm/pg-core'

// Counters of rate-limiter-flexible's Drizzle store (column names are its own): one row per key,
// counted with one INSERT … ON CONFLICT DO UPDATE, so concurrent requests never read a stale count.
// In the database, not in memory, so sign-in limits hold across server instances and restarts.
export const rateLimits = pgTable('rate_limits', {
  key: text('key').primaryKey(),
  points: integer('points').notNull().default(0),
  expire: timestamp('expire', { withTimezone: true }),
})
