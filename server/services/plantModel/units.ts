import { and, count, eq, isNull } from 'drizzle-orm'
import type { UnitCreate, UnitPatch } from '#shared/schemas/plant'
import { changedFields } from '#shared/utils/changedFields'
import type { DbTransaction } from '../../utils/db'
import { sites, tags, units } from '../../db/schema'
import { PlantConflict, PlantInputRefused, refuseDuplicateCode } from './errors'

const UNIT_FIELDS = ['code', 'name', 'kind', 'description'] as const

const duplicateCode = (err: unknown, code: string | undefined): never => refuseDuplicateCode(err, `a unit with code "${code}" already exists on this site`)

export async function createUnit(tx: DbTransaction, input: UnitCreate) {
  const [site] = await tx.select().from(sites).where(eq(sites.id, input.siteId))
  if (!site) throw new PlantInputRefused('siteId', `site ${input.siteId} does not exist`)
  if (site.retiredAt) throw new PlantInputRefused('siteId', `site ${site.code} is retired; restore it first`)
  const [unit] = await tx.insert(units).values(input).returning().catch(err => duplicateCode(err, input.code))
  return unit!
}

export async function updateUnit(tx: DbTransaction, id: number, patch: UnitPatch) {
  const [before] = await tx.select().from(units).where(eq(units.id, id)).for('update')
  if (!before) return undefined
  const [after] = await tx.update(units).set(patch).where(eq(units.id, id)).returning().catch(err => duplicateCode(err, patch.code))
  return { unit: after!, changed: changedFields(before, after!, UNIT_FIELDS) }
}

/** Retires a unit once its tags are retired; restores it only on a site in service. */
export async function setUnitRetired(tx: DbTransaction, id: number, retired: boolean) {
  const [before] = await tx.select().from(units).where(eq(units.id, id)).for('update')
  if (!before) return undefined
  if (retired) {
    const [live] = await tx.select({ n: count() }).from(tags).where(and(eq(tags.unitId, id), isNull(tags.retiredAt)))
    if (live!.n > 0) throw new PlantConflict(`Unit ${before.code} still has ${live!.n} tag(s) in service: retire them first`)
  }
  else {
    const [site] = await tx.select().from(sites).where(eq(sites.id, before.siteId))
    if (site!.retiredAt) throw new PlantConflict(`Unit ${before.code} is on retired site ${site!.code}: restore the site first`)
  }
  const [after] = await tx.update(units).set({ retiredAt: retired ? (before.retiredAt ?? new Date()) : null })
    .where(eq(units.id, id)).returning()
  return { unit: after!, changed: changedFields(before, after!, ['retiredAt']) }
}
