import { createError } from 'h3'
import { eq, sql } from 'drizzle-orm'
import type { TagCreate } from '#shared/schemas/plant'
import { opcuaConnections, opcuaMappings } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'
import { PlantConflict, PlantInputRefused } from '../plantModel/errors'
import { createTag } from '../plantModel/tags'

// A tag made from a browsed plant variable and read from it at once (issue 17 item 1): the tag is
// made by the plant model's own createTag, so the same checks hold as on the workbench, and the
// mapping is added in the same transaction, so there is never a tag the picker made but does not read.

/** Field names in refusals carry the body's `tag.` prefix, so the form can point at the right box. */
function tagFieldError(err: unknown): unknown {
  if (err instanceof PlantInputRefused) return createError({ statusCode: 400, message: `tag.${err.message}` })
  if (err instanceof PlantConflict) return createError({ statusCode: 409, message: `tag.${err.message}` })
  return err
}

export async function createTagFromVariable(tx: DbTransaction, connectionId: number, nodeId: string, displayName: string,
  input: TagCreate) {
  const [connection] = await tx.select().from(opcuaConnections).where(eq(opcuaConnections.id, connectionId)).for('update')
  if (!connection) return undefined
  const [taken] = await tx.select({ id: opcuaMappings.id }).from(opcuaMappings)
    .where(sql`${opcuaMappings.connectionId} = ${connectionId} and ${opcuaMappings.nodeId} = ${nodeId}`)
  if (taken) throw createError({ statusCode: 409, message: `nodeId: ${nodeId} is already read into a tag of this connection` })
  const tag = await createTag(tx, input).catch((err) => { throw tagFieldError(err) })
  // The collector writes by tag code within the connection's site.
  if (tag.siteId !== connection.siteId)
    throw createError({ statusCode: 400, message: `tag.unitId: unit ${input.unitId} is on another site than this connection` })
  await tx.insert(opcuaMappings).values({ connectionId, nodeId, tagId: tag.id, displayName })
  await tx.update(opcuaConnections).set({ configVersion: sql`${opcuaConnections.configVersion} + 1` }).where(eq(opcuaConnections.id, connectionId))
  return { connection, tag }
}
