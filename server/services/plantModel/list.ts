import { asc } from 'drizzle-orm'
import { sites, tags, units } from '../../db/schema'

/** The whole plant model as the workbench edits it, retired rows included (they are marked). */
export async function readPlantModel(db: Db) {
  const [siteRows, unitRows, tagRows] = await Promise.all([
    db.select().from(sites).orderBy(asc(sites.code)),
    db.select().from(units).orderBy(asc(units.code)),
    db.select().from(tags).orderBy(asc(tags.code)),
  ])
  return { sites: siteRows, units: unitRows, tags: tagRows }
}
