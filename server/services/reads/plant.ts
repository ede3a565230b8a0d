import { and, asc, count, eq, isNull, sql } from 'drizzle-orm'
import { sites, tags, units } from '../../db/schema'
import type { Db } from '../../utils/db'

export function listSites(db: Db) {
  return db.select().from(sites).where(isNull(sites.retiredAt)).orderBy(asc(sites.name))
}

export function listUnits(db: Db) {
  return db.select({
    id: units.id, siteId: units.siteId, code: units.code, name: units.name, kind: units.kind,
    description: units.description, siteName: sites.name, tagCount: count(tags.id),
  }).from(units)
    .innerJoin(sites, eq(sites.id, units.siteId))
    .leftJoin(tags, and(eq(tags.unitId, units.id), isNull(tags.retiredAt)))
    .where(isNull(units.retiredAt))
    .groupBy(units.id, sites.name)
    .orderBy(asc(units.code))
}

/**
 * Tags in service (retired ones are on the workbench) with their latest sample (one index probe per tag
 * through the samples primary key).
 */
export function listTagsWithLatest(db: Db) {
  return db.select({
    id: tags.id, code: tags.code, description: tags.description, engineeringUnit: tags.engineeringUnit,
    samplePeriodS: tags.samplePeriodS, rangeLow: tags.rangeLow, rangeHigh: tags.rangeHigh,
    noiseFloor: tags.noiseFloor, unitId: tags.unitId, unitCode: units.code,
    latestTime: sql<string | null>`latest.time`, latestValue: sql<number | null>`latest.value`,
  }).from(tags)
    .innerJoin(units, eq(units.id, tags.unitId))
    .leftJoin(sql`lateral (select s.time, s.value from samples s where s.tag_id = ${tags.id} order by s.time desc limit 1) as latest`, sql`true`)
    .where(isNull(tags.retiredAt))
    .orderBy(asc(tags.code))
}
