import { and, count, eq, isNull } from 'drizzle-orm'
import type { SiteCreate, SitePatch } from '#shared/schemas/plant'
import { changedFields } from '#shared/utils/changedFields'
import type { DbTransaction } from '../../utils/db'
import { sites, units } from '../../db/schema'
import { PlantConflict, refuseDuplicateCode } from './errors'

const SITE_FIELDS = ['code', 'name', 'company', 'timeZone'] as const

const duplicateCode = (err: unknown, code: string | undefined): never => refuseDuplicateCode(err, `a site with code "${code}" already exists`)

export async function createSite(tx: DbTransaction, input: SiteCreate) {
  const [site] = await tx.insert(sites).values(input).returning().catch(err => duplicateCode(err, input.code))
  return site!
}

/** Changes a site; undefined when there is none with this id. */
export async function updateSite(tx: DbTransaction, id: number, patch: SitePatch) {
  const [before] = await tx.select().from(sites).where(eq(sites.id, id)).for('update')
  if (!before) return undefined
  const [after] = await tx.update(sites).set(patch).where(eq(sites.id, id)).returning().catch(err => duplicateCode(err, patch.code))
  return { site: after!, changed: changedFields(before, after!, SITE_FIELDS) }
}

/** Retires a site once all its units are retired; its history stays. */
export async function setSiteRetired(tx: DbTransaction, id: number, retired: boolean) {
  const [before] = await tx.select().from(sites).where(eq(sites.id, id)).for('update')
  if (!before) return undefined
  if (retired) {
    const [live] = await tx.select({ n: count() }).from(units).where(and(eq(units.siteId, id), isNull(units.retiredAt)))
    if (live!.n > 0) throw new PlantConflict(`Site ${before.code} still has ${live!.n} unit(s) in service: retire them first`)
  }
  const [after] = await tx.update(sites).set({ retiredAt: retired ? (before.retiredAt ?? new Date()) : null })
    .where(eq(sites.id, id)).returning()
  return { site: after!, changed: changedFields(before, after!, ['retiredAt']) }
}
