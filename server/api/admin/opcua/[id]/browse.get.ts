import { idParamsSchema } from '#shared/schemas/fields'
import { opcuaBrowseQuerySchema } from '#shared/schemas/opcua'
import { browseChildren, OBJECTS_FOLDER } from '../../../../services/opcua/addressSpaceBrowse'
import { connectionEndpoint } from '../../../../services/opcua/connectionRecords'
import { opcuaPkiDir } from '../../../../services/opcua/plantClient'

// One step of the admin's walk through a connection's plant server, to pick variables for its
// node table. Read-only: a session and Browse, nothing that could change the plant.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const { nodeId } = await validQuery(event, opcuaBrowseQuerySchema)
  const target = await connectionEndpoint(useDb(), id)
  if (!target) throw createError({ statusCode: 404, message: `id: OPC UA connection ${id} not found` })
  const at = nodeId ?? OBJECTS_FOLDER
  return { nodeId: at, children: await browseChildren(target, opcuaPkiDir(), at) }
})
