import { idParamsSchema } from '#shared/schemas/fields'
import { connectionFacts, deleteConnection } from '../../../../services/opcua/connectionAdmin'

// Its node mappings go with it (cascade); samples already stored stay on their tags.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  return useDb().transaction(async (tx) => {
    const row = await deleteConnection(tx, id)
    if (!row) throw createError({ statusCode: 404, message: `id: OPC UA connection ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'opcua.connection.delete', target: row.name,
      detail: { id, before: connectionFacts(row), after: null }, address: clientAddress(event) })
    return { id, deleted: true }
  })
})
