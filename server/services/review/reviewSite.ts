import type { Db } from '../../utils/db'
import { ReviewInputError } from './reviewErrors'

export interface ReviewSite { id: number, code: string, name: string, timeZone: string }

/** The site a review reads: the one named, or the only site in service when none is named. */
export async function reviewSite(db: Db, siteId: number | undefined): Promise<ReviewSite> {
  const sql = db.$sql
  if (siteId !== undefined) {
    const [site] = await sql<ReviewSite[]>`select id, code, name, time_zone as "timeZone" from sites where id = ${siteId}`
    if (!site) throw new ReviewInputError('siteId', 404, `site ${siteId} does not exist`)
    return site
  }
  const sites = await sql<ReviewSite[]>`
    select id, code, name, time_zone as "timeZone" from sites where retired_at is null order by id limit 2`
  if (sites.length !== 1) throw new ReviewInputError('siteId', 400, sites.length ? 'is required when there are several sites' : 'no site exists yet')
  return sites[0]!
}
