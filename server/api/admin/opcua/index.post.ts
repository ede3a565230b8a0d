import { opcuaConnectionCreateSchema } from '#shared/schemas/opcua'
import { connectionFacts, createConnection } from '../../../services/opcua/connectionAdmin'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const input = await validBody(event, opcuaConnectionCreateSchema)
  const created = await useDb().transaction(async (tx) => {
    const row = await createConnection(tx, input).catch((err) => {
      throw constraintHttpError(err, {
        duplicate: `name: a connection called "${input.name}" already exists on this site`,
        missingReference: `siteId: site ${input.siteId} does not exist`,
      })
    })
    await writeAudit(tx, { userId: user.id, action: 'opcua.connection.create', target: row.name,
      detail: { id: row.id, before: null, after: connectionFacts(row) }, address: clientAddress(event) })
    return row
  })
  setResponseStatus(event, 201)
  return { id: created.id, ...connectionFacts(created) }
})
