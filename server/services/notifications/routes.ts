import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm'
import type { RouteCreate, RouteUpdate } from '../../../shared/schemas/notificationRoute'
import { hoursRule, recipientRule } from '../../../shared/schemas/notificationRoute'
import { routeTestMail } from '../../../shared/notifications/accountMail'
import { notificationOutbox, notificationRoutes, sites, units, users } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'

export type RouteRow = typeof notificationRoutes.$inferSelect

export class RouteInputError extends Error {}

export function listRoutes(db: DbExecutor) {
  return db.select({ route: notificationRoutes, siteName: sites.name, timeZone: sites.timeZone, unitCode: units.code })
    .from(notificationRoutes)
    .innerJoin(sites, eq(sites.id, notificationRoutes.siteId))
    .leftJoin(units, eq(units.id, notificationRoutes.unitId))
    .orderBy(asc(sites.name), asc(notificationRoutes.name), asc(notificationRoutes.id))
    .then(rows => rows.map(r => ({ ...r.route, siteName: r.siteName, timeZone: r.timeZone, unitCode: r.unitCode })))
}

/** The unit must belong to the route's site (the foreign keys alone would allow another site's unit). */
async function checkUnit(db: DbExecutor, siteId: number, unitId: number | null) {
  if (unitId === null) return
  const [unit] = await db.select({ id: units.id }).from(units).where(and(eq(units.id, unitId), eq(units.siteId, siteId)))
  if (!unit) throw new RouteInputError(`unitId: unit ${unitId} is not on site ${siteId}`)
}

async function checkSite(db: DbExecutor, siteId: number) {
  const [site] = await db.select({ id: sites.id }).from(sites).where(eq(sites.id, siteId))
  if (!site) throw new RouteInputError(`siteId: site ${siteId} does not exist`)
}

export async function createRoute(tx: DbExecutor, input: RouteCreate): Promise<RouteRow> {
  await checkSite(tx, input.siteId)
  await checkUnit(tx, input.siteId, input.unitId)
  const [row] = await tx.insert(notificationRoutes).values(input).returning()
  return row!
}

export async function updateRoute(tx: DbExecutor, id: number, change: RouteUpdate) {
  const [before] = await tx.select().from(notificationRoutes).where(eq(notificationRoutes.id, id)).for('update')
  if (!before) return null
  const merged = { ...before, ...change }
  if (!recipientRule(merged)) throw new RouteInputError('email: give either an e-mail address or a role')
  if (!hoursRule(merged)) throw new RouteInputError('workEndMinute: must differ from workStartMinute')
  if (change.siteId !== undefined) await checkSite(tx, merged.siteId)
  if (change.siteId !== undefined || change.unitId !== undefined) await checkUnit(tx, merged.siteId, merged.unitId)
  const [after] = await tx.update(notificationRoutes).set(change).where(eq(notificationRoutes.id, id)).returning()
  return { before, after: after! }
}

export async function deleteRoute(tx: DbExecutor, id: number) {
  const [before] = await tx.delete(notificationRoutes).where(eq(notificationRoutes.id, id)).returning()
  return before ?? null
}

/** The addresses a route sends to now: its own address, or every active user of its role. */
export async function routeAddresses(db: DbExecutor, routes: Pick<RouteRow, 'email' | 'role'>[]): Promise<string[]> {
  const roles = [...new Set(routes.flatMap(r => (r.role ? [r.role] : [])))]
  const byRole = roles.length === 0 ? [] : await db.select({ email: users.email }).from(users)
    .where(and(inArray(users.role, roles), eq(users.active, true)))
  return [...new Set([...routes.flatMap(r => (r.email ? [r.email] : [])), ...byRole.map(u => u.email)])].sort()
}

/** Queues a test message of the route through the real outbox (delivered by the sender task). */
export async function queueRouteTest(tx: DbExecutor, id: number, sentBy: string) {
  const [row] = await tx.select({ route: notificationRoutes, siteName: sites.name }).from(notificationRoutes)
    .innerJoin(sites, eq(sites.id, notificationRoutes.siteId)).where(eq(notificationRoutes.id, id))
  if (!row) return null
  const recipients = await routeAddresses(tx, [row.route])
  if (recipients.length === 0) throw new RouteInputError(`role: no active user has the role ${row.route.role}, so the test has no recipient`)
  const mail = routeTestMail({ routeName: row.route.name || `#${id}`, siteName: row.siteName, sentBy })
  const [queued] = await tx.insert(notificationOutbox).values({
    kind: 'test', siteId: row.route.siteId, routeIds: [id], recipients, subject: mail.subject, body: mail.text,
  }).returning({ id: notificationOutbox.id })
  return { outboxId: queued!.id, recipients, route: row.route }
}

/** The route's messages, newest first, with what happened to each (sent, retrying, failed) and its attempts. */
export function routeDeliveries(db: DbExecutor, id: number, limit = 50) {
  return db.select({
    id: notificationOutbox.id, kind: notificationOutbox.kind, subject: notificationOutbox.subject,
    recipients: notificationOutbox.recipients, status: notificationOutbox.status, attempts: notificationOutbox.attempts,
    createdAt: notificationOutbox.createdAt, sentAt: notificationOutbox.sentAt, nextAttemptAt: notificationOutbox.nextAttemptAt,
    lastError: notificationOutbox.lastError,
    // Written out with an alias: inside a selection drizzle leaves column names unqualified.
    failedAttempts: sql<number>`(select count(*)::int from outbox_attempts a where a.outbox_id = ${notificationOutbox}.id and not a.ok)`,
  }).from(notificationOutbox)
    .where(sql`${id}::int = any(${notificationOutbox.routeIds})`)
    .orderBy(desc(notificationOutbox.id)).limit(limit)
}
