import { pgTable, serial, integer, text, timestamp, bigint, boolean, unique, check } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { sites, tags } from './plant'

// A plant OPC UA server Brinkline reads from (never writes to). The password is stored only
// encrypted (server/services/opcua/connectionSecret.ts); the status columns are written by the
// server instance that owns the connection (advisory lock, server/services/opcua/supervisor.ts).
export const opcuaConnections = pgTable('opcua_connections', {
  id: serial('id').primaryKey(),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  endpointUrl: text('endpoint_url').notNull(),
  securityMode: text('security_mode').notNull().default('None'),
  securityPolicy: text('security_policy').notNull().default('None'),
  username: text('username'),
  passwordSecret: text('password_secret'),
  samplingIntervalMs: integer('sampling_interval_ms').notNull().default(1000),
  publishingIntervalMs: integer('publishing_interval_ms').notNull().default(1000),
  enabled: boolean('enabled').notNull().default(true),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  // Bumped on every configuration change (mappings included): the owner restarts its collector.
  configVersion: integer('config_version').notNull().default(1),
  state: text('state').notNull().default('idle'),
  stateSince: timestamp('state_since', { withTimezone: true }),
  owner: text('owner'),
  lastValueAt: timestamp('last_value_at', { withTimezone: true }),
  valuesPerMinute: integer('values_per_minute').notNull().default(0),
  acceptedCount: bigint('accepted_count', { mode: 'number' }).notNull().default(0),
  duplicateCount: bigint('duplicate_count', { mode: 'number' }).notNull().default(0),
  rejectedCount: bigint('rejected_count', { mode: 'number' }).notNull().default(0),
  backfilledCount: bigint('backfilled_count', { mode: 'number' }).notNull().default(0),
  reconnectCount: bigint('reconnect_count', { mode: 'number' }).notNull().default(0),
  lastError: text('last_error'),
  lastErrorAt: timestamp('last_error_at', { withTimezone: true }),
}, t => [
  unique('opcua_connections_site_name').on(t.siteId, t.name),
  check('opcua_connections_security_mode', sql`${t.securityMode} in ('None', 'Sign', 'SignAndEncrypt')`),
  check('opcua_connections_intervals', sql`${t.samplingIntervalMs} >= 0 and ${t.publishingIntervalMs} > 0`),
])

// One server variable feeding one tag. A tag has at most one OPC UA source, so two connections
// can never interleave readings of one measurement.
export const opcuaMappings = pgTable('opcua_mappings', {
  id: serial('id').primaryKey(),
  connectionId: integer('connection_id').notNull().references(() => opcuaConnections.id, { onDelete: 'cascade' }),
  nodeId: text('node_id').notNull(),
  tagId: integer('tag_id').notNull().references(() => tags.id, { onDelete: 'cascade' }).unique(),
  displayName: text('display_name').notNull().default(''),
  // Which clock the last stored value carried: 'source' (the device's), 'server' (the OPC UA
  // server's, when the source gave none).
  timeBasis: text('time_basis'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, t => [unique('opcua_mappings_connection_node').on(t.connectionId, t.nodeId)])
