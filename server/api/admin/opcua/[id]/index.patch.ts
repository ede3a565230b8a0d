import { idParamsSchema } from '#shared/schemas/fields'
import { opcuaConnectionUpdateSchema } from '#shared/schemas/opcua'
import { connectionFacts, updateConnection } from '../../../../services/opcua/connectionAdmin'

// Edits and enable/disable; a password sent is stored encrypted and never answered back.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const input = await validBody(event, opcuaConnectionUpdateSchema)
  return useDb().transaction(async (tx) => {
    const changed = await updateConnection(tx, id, input).catch((err) => {
      throw constraintHttpError(err, { duplicate: `name: a connection called "${input.name}" already exists on this site` })
    })
    if (!changed) throw createError({ statusCode: 404, message: `id: OPC UA connection ${id} not found` })
    const action = Object.keys(input).length === 1 && input.enabled !== undefined
      ? (input.enabled ? 'opcua.connection.enable' : 'opcua.connection.disable')
      : 'opcua.connection.update'
    await writeAudit(tx, { userId: user.id, action, target: changed.after.name,
      detail: { id, passwordChanged: input.password !== undefined,
        before: connectionFacts(changed.before), after: connectionFacts(changed.after) },
      address: clientAddress(event) })
    return { id, ...connectionFacts(changed.after) }
  })
})
