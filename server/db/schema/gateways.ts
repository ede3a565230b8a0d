import { pgTable, serial, integer, text, timestamp, bigint, unique, primaryKey } from 'drizzle-orm/pg-core'
import { sites } from './plant'

// A data source with its own ingest key. Keys are 256-bit random strings, so a SHA-256 digest is
// enough to store them safely (no slow hash needed, unlike human passwords); only the digest and
// a short prefix for recognising the key are kept.
export const gateways = pgTable('gateways', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  keyHash: text('key_hash').notNull().unique(),
  keyPrefix: text('key_prefix').notNull(),
  /** After a rotation the replaced key keeps working until previous_key_expires_at (grace period). */
  previousKeyHash: text('previous_key_hash').unique(),
  previousKeyPrefix: text('previous_key_prefix'),
  previousKeyExpiresAt: timestamp('previous_key_expires_at', { withTimezone: true }),
  keyRotatedAt: timestamp('key_rotated_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  revokedAt: timestamp('revoked_at', { withTimezone: true }),
  lastContactAt: timestamp('last_contact_at', { withTimezone: true }),
  acceptedCount: bigint('accepted_count', { mode: 'number' }).notNull().default(0),
  duplicateCount: bigint('duplicate_count', { mode: 'number' }).notNull().default(0),
  rejectedCount: bigint('rejected_count', { mode: 'number' }).notNull().default(0),
  failedBatchCount: bigint('failed_batch_count', { mode: 'number' }).notNull().default(0),
  lastError: text('last_error'),
}, t => [unique('gateways_site_name').on(t.siteId, t.name)])

// Per gateway and clock hour, what ingest saw: written in the same transaction as the samples, so
// samples per hour and rejections can be charted without scanning the samples table.
export const gatewayHourly = pgTable('gateway_hourly', {
  gatewayId: integer('gateway_id').notNull().references(() => gateways.id, { onDelete: 'cascade' }),
  hour: timestamp('hour', { withTimezone: true }).notNull(),
  acceptedCount: bigint('accepted_count', { mode: 'number' }).notNull().default(0),
  duplicateCount: bigint('duplicate_count', { mode: 'number' }).notNull().default(0),
  rejectedCount: bigint('rejected_count', { mode: 'number' }).notNull().default(0),
  failedBatchCount: bigint('failed_batch_count', { mode: 'number' }).notNull().default(0),
}, t => [primaryKey({ columns: [t.gatewayId, t.hour] })])
