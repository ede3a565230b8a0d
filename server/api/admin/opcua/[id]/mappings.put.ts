import { idParamsSchema } from '#shared/schemas/fields'
import { opcuaMappingsSchema } from '#shared/schemas/opcua'
import { replaceMappings } from '../../../../services/opcua/connectionAdmin'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const { mappings } = await validBody(event, opcuaMappingsSchema)
  return useDb().transaction(async (tx) => {
    const replaced = await replaceMappings(tx, id, mappings).catch((err) => {
      throw constraintHttpError(err, { duplicate: 'mappings: a tag in the list is already read from another OPC UA connection' })
    })
    if (!replaced) throw createError({ statusCode: 404, message: `id: OPC UA connection ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'opcua.mappings.replace', target: replaced.connection.name,
      detail: { id, before: replaced.before, after: replaced.after }, address: clientAddress(event) })
    return { id, mappings: replaced.after }
  })
})
