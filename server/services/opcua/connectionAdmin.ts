import { createError } from 'h3'
import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm'
import type { OpcuaConnectionCreate, OpcuaConnectionUpdate } from '#shared/schemas/opcua'
import { opcuaConnections, opcuaMappings, sites, tags } from '../../db/schema'
import type { Db, DbExecutor } from '../../utils/db'
import { encryptSecret, secretKeyConfigured } from './connectionSecret'

// The admin side of OPC UA connections (issue 17 item 1): what the screen lists and changes. The
// stored password is never read back out of here: callers see only whether one is set.

type ConnectionRow = typeof opcuaConnections.$inferSelect

/** The settings of a connection as the audit log records them: the password only as set or not. */
export function connectionFacts(row: ConnectionRow) {
  return {
    siteId: row.siteId, name: row.name, endpointUrl: row.endpointUrl, securityMode: row.securityMode, securityPolicy: row.securityPolicy,
    username: row.username, passwordSet: row.passwordSecret !== null, samplingIntervalMs: row.samplingIntervalMs,
    publishingIntervalMs: row.publishingIntervalMs, enabled: row.enabled,
  }
}

/** The stored form of a password from a form: encrypted, null to remove, undefined to keep. */
function storedPassword(password: string | null | undefined): string | null | undefined {
  if (password === undefined || password === null) return password
  if (!secretKeyConfigured())
    throw createError({ statusCode: 400, message: 'password: cannot be stored, BRINKLINE_OPCUA_SECRET_KEY is not set on this server' })
  return encryptSecret(password)
}

export async function listConnections(db: Db) {
  const [rows, maps] = await Promise.all([
    db.select().from(opcuaConnections).orderBy(asc(opcuaConnections.name)),
    db.select({ connectionId: opcuaMappings.connectionId, nodeId: opcuaMappings.nodeId, tagId: opcuaMappings.tagId, tagCode: tags.code,
      displayName: opcuaMappings.displayName, timeBasis: opcuaMappings.timeBasis })
      .from(opcuaMappings).innerJoin(tags, eq(tags.id, opcuaMappings.tagId)).orderBy(asc(opcuaMappings.id)),
  ])
  const siteNames = new Map((await db.select({ id: sites.id, name: sites.name }).from(sites)).map(s => [s.id, s.name]))
  return rows.map(row => ({
    id: row.id, ...connectionFacts(row), siteName: siteNames.get(row.siteId) ?? '', configVersion: row.configVersion,
    status: {
      state: row.state, stateSince: row.stateSince, owner: row.owner, lastValueAt: row.lastValueAt, valuesPerMinute: row.valuesPerMinute,
      acceptedCount: row.acceptedCount, duplicateCount: row.duplicateCount, rejectedCount: row.rejectedCount,
      backfilledCount: row.backfilledCount, reconnectCount: row.reconnectCount, lastError: row.lastError, lastErrorAt: row.lastErrorAt,
    },
    mappings: maps.filter(m => m.connectionId === row.id).map(({ connectionId: _, ...m }) => m),
  }))
}

export async function createConnection(db: DbExecutor, input: OpcuaConnectionCreate) {
  const { password, ...fields } = input
  const [row] = await db.insert(opcuaConnections).values({ ...fields, passwordSecret: storedPassword(password) ?? null }).returning()
  return row!
}

/** Changes the given settings and bumps the config version so the owning collector restarts. */
export async function updateConnection(db: DbExecutor, id: number, input: OpcuaConnectionUpdate) {
  const [before] = await db.select().from(opcuaConnections).where(eq(opcuaConnections.id, id)).for('update')
  if (!before) return undefined
  const { password, ...fields } = input
  const passwordSecret = storedPassword(password)
  // No user name, no password: an anonymous sign-in sends none.
  const clearsUser = fields.username === null
  const mode = fields.securityMode ?? before.securityMode
  const policy = fields.securityPolicy ?? before.securityPolicy
  if ((mode === 'None') !== (policy === 'None'))
    throw createError({ statusCode: 400, message: `securityPolicy: must be None exactly when securityMode is None (it is ${mode})` })
  const [after] = await db.update(opcuaConnections).set({
    ...fields,
    ...(passwordSecret !== undefined || clearsUser ? { passwordSecret: clearsUser ? null : passwordSecret } : {}),
    configVersion: sql`${opcuaConnections.configVersion} + 1`,
  }).where(eq(opcuaConnections.id, id)).returning()
  return { before, after: after! }
}

export async function deleteConnection(db: DbExecutor, id: number) {
  const [row] = await db.delete(opcuaConnections).where(eq(opcuaConnections.id, id)).returning()
  return row
}

/**
 * Replaces the node-to-tag table of a connection. Every tag must be a live tag of the connection's
 * site: the collector writes by tag code within that site.
 */
export async function replaceMappings(db: DbExecutor, id: number, mappings: { nodeId: string, tagId: number }[]) {
  const [connection] = await db.select().from(opcuaConnections).where(eq(opcuaConnections.id, id)).for('update')
  if (!connection) return undefined
  const tagIds = mappings.map(m => m.tagId)
  const found = tagIds.length === 0
    ? []
    : await db.select({ id: tags.id, code: tags.code }).from(tags)
      .where(and(inArray(tags.id, tagIds), eq(tags.siteId, connection.siteId), isNull(tags.retiredAt)))
  const codes = new Map(found.map(t => [t.id, t.code]))
  const missing = mappings.findIndex(m => !codes.has(m.tagId))
  if (missing >= 0)
    throw createError({ statusCode: 400, message: `mappings.${missing}.tagId: no live tag ${mappings[missing]!.tagId} on this connection's site` })
  const before = await db.select({ nodeId: opcuaMappings.nodeId, tagId: opcuaMappings.tagId }).from(opcuaMappings)
    .where(eq(opcuaMappings.connectionId, id)).orderBy(asc(opcuaMappings.id))
  await db.delete(opcuaMappings).where(eq(opcuaMappings.connectionId, id))
  if (mappings.length > 0)
    await db.insert(opcuaMappings).values(mappings.map(m => ({ connectionId: id, nodeId: m.nodeId, tagId: m.tagId })))
  await db.update(opcuaConnections).set({ configVersion: sql`${opcuaConnections.configVersion} + 1` }).where(eq(opcuaConnections.id, id))
  return { connection, before, after: mappings.map(m => ({ ...m, tagCode: codes.get(m.tagId)! })) }
}
