import { and, eq } from 'drizzle-orm'
import { routeWants } from '../../../shared/notifications/routeMatch'
import type { AlarmClass, Priority } from '../../../shared/alarms/vocabulary'
import { notificationRoutes, sites } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'
import { routeAddresses, type RouteRow } from './routes'

export interface Recipients { emails: string[], routeIds: number[] }

/**
 * Who is told about this alarm now, split by the routes' delivery preference: `immediate` routes
 * get a mail of its own (or the flood digest), `digest` routes always get the site's digest.
 * The routes are read with the site (one query), then judged by routeWants (class, unit,
 * priority, working hours in the site's zone).
 */
export async function alarmRecipients(
  db: DbExecutor, alarm: { siteId: number, unitId: number, priority: string, alarmClass: string }, now = new Date(),
): Promise<{ immediate: Recipients, digest: Recipients }> {
  const rows = await db.select({ route: notificationRoutes, timeZone: sites.timeZone }).from(notificationRoutes)
    .innerJoin(sites, eq(sites.id, notificationRoutes.siteId))
    .where(and(eq(notificationRoutes.siteId, alarm.siteId), eq(notificationRoutes.enabled, true)))
  const facts = {
    siteId: alarm.siteId, unitId: alarm.unitId, priority: alarm.priority as Priority, alarmClass: alarm.alarmClass as AlarmClass,
  }
  const wanted = rows.filter(r => routeWants({ ...r.route, minPriority: r.route.minPriority as Priority, alarmClasses: r.route.alarmClasses as AlarmClass[], hours: r.route.hours as 'always' | 'working' }, facts, now, r.timeZone))
    .map(r => r.route)
  const split = async (routes: RouteRow[]): Promise<Recipients> => ({
    emails: await routeAddresses(db, routes), routeIds: routes.map(r => r.id),
  })
  return {
    immediate: await split(wanted.filter(r => r.delivery !== 'digest')),
    digest: await split(wanted.filter(r => r.delivery === 'digest')),
  }
}
