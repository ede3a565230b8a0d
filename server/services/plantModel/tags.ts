import { eq } from 'drizzle-orm'
import { tagCrossIssues, type TagCreate, type TagPatch } from '#shared/schemas/plant'
import { changedFields } from '#shared/utils/changedFields'
import type { DbTransaction } from '../../utils/db'
import { alarmRules, tags, units } from '../../db/schema'
import { PlantConflict, PlantInputRefused, refuseDuplicateCode } from './errors'

type TagRow = typeof tags.$inferSelect

const TAG_FIELDS = ['unitId', 'code', 'description', 'engineeringUnit', 'samplePeriodS', 'rangeLow', 'rangeHigh',
  'noiseFloor', 'quantisationStep', 'loopTagId', 'loopRole'] as const satisfies readonly (keyof TagRow)[]

const duplicateCode = (err: unknown, code: string | undefined): never => refuseDuplicateCode(err, `a tag called "${code}" already exists on this site`)

async function unitInService(tx: DbTransaction, unitId: number) {
  const [unit] = await tx.select().from(units).where(eq(units.id, unitId))
  if (!unit) throw new PlantInputRefused('unitId', `unit ${unitId} does not exist`)
  if (unit.retiredAt) throw new PlantInputRefused('unitId', `unit ${unit.code} is retired; restore it first`)
  return unit
}

/** The loop a tag joins must be another tag in service on the same site. */
async function checkLoopTag(tx: DbTransaction, loopTagId: number | null, siteId: number, selfId?: number) {
  if (loopTagId === null) return
  if (loopTagId === selfId) throw new PlantInputRefused('loopTagId', 'a tag cannot be part of its own loop')
  const [loop] = await tx.select().from(tags).where(eq(tags.id, loopTagId))
  if (!loop || loop.siteId !== siteId) throw new PlantInputRefused('loopTagId', `tag ${loopTagId} does not exist on this site`)
  if (loop.retiredAt) throw new PlantInputRefused('loopTagId', `tag ${loop.code} is retired`)
}

export async function createTag(tx: DbTransaction, input: TagCreate) {
  const unit = await unitInService(tx, input.unitId)
  await checkLoopTag(tx, input.loopTagId, unit.siteId)
  const [tag] = await tx.insert(tags).values({ ...input, siteId: unit.siteId }).returning().catch(err => duplicateCode(err, input.code))
  return tag!
}

/** Cross-field checks of the tag as it would be after the patch (a patch may change one end of the range). */
function checkMerged(merged: TagRow) {
  const [issue] = tagCrossIssues(merged)
  if (issue) throw new PlantInputRefused(issue.field, issue.message)
}

/**
 * Changes a tag. A new unit must be on the same site (the tag's samples, points and alarms stay
 * with it); the unit of the tag's alarm rules follows.
 */
export async function updateTag(tx: DbTransaction, id: number, patch: TagPatch) {
  const [before] = await tx.select().from(tags).where(eq(tags.id, id)).for('update')
  if (!before) return undefined
  const merged = { ...before, ...patch }
  checkMerged(merged)
  if (patch.unitId !== undefined && patch.unitId !== before.unitId) {
    const unit = await unitInService(tx, patch.unitId)
    if (unit.siteId !== before.siteId) throw new PlantInputRefused('unitId', `unit ${unit.code} is on another site; a tag stays on its site`)
    await tx.update(alarmRules).set({ unitId: unit.id }).where(eq(alarmRules.tagId, id))
  }
  if (patch.loopTagId !== undefined) await checkLoopTag(tx, merged.loopTagId, before.siteId, id)
  const [after] = await tx.update(tags).set(patch).where(eq(tags.id, id)).returning().catch(err => duplicateCode(err, patch.code))
  return { tag: after!, changed: changedFields(before, after!, TAG_FIELDS) }
}

/**
 * Retiring stops the pipeline watching the tag; its samples, indicator points, alarms and rules
 * stay, so its story can still be read, and restoring picks it up again.
 */
export async function setTagRetired(tx: DbTransaction, id: number, retired: boolean) {
  const [before] = await tx.select().from(tags).where(eq(tags.id, id)).for('update')
  if (!before) return undefined
  if (!retired) {
    const [unit] = await tx.select().from(units).where(eq(units.id, before.unitId))
    if (unit!.retiredAt) throw new PlantConflict(`Tag ${before.code} is on retired unit ${unit!.code}: restore the unit first`)
  }
  const [after] = await tx.update(tags)
    .set({ retiredAt: retired ? (before.retiredAt ?? new Date()) : null, watched: !retired })
    .where(eq(tags.id, id)).returning()
  return { tag: after!, changed: changedFields(before, after!, ['retiredAt', 'watched']) }
}

