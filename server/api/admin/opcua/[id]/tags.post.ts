import { idParamsSchema } from '#shared/schemas/fields'
import { opcuaTagFromVariableSchema } from '#shared/schemas/opcua'
import { createTagFromVariable } from '../../../../services/opcua/tagFromVariable'

// The picker's "create a tag from this variable": the tag and its mapping in one transaction,
// each audited. Admin only, like the rest of a connection's node table (docs/opcua.md §O4).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const { nodeId, displayName, tag: input } = await validBody(event, opcuaTagFromVariableSchema)
  const created = await useDb().transaction(async (tx) => {
    const made = await createTagFromVariable(tx, id, nodeId, displayName, input)
    if (!made) throw createError({ statusCode: 404, message: `id: OPC UA connection ${id} not found` })
    const address = clientAddress(event)
    await writeAudit(tx, { userId: user.id, action: 'tag.create', target: made.tag.code,
      detail: { id: made.tag.id, after: made.tag, fromOpcuaNode: { connectionId: id, nodeId } }, address })
    await writeAudit(tx, { userId: user.id, action: 'opcua.mapping.add', target: made.connection.name,
      detail: { id, after: { nodeId, tagId: made.tag.id, tagCode: made.tag.code } }, address })
    return made.tag
  })
  setResponseStatus(event, 201)
  return { id: created.id, code: created.code, nodeId }
})
