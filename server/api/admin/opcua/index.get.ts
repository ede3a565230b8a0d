import { listConnections } from '../../../services/opcua/connectionAdmin'
import { secretKeyConfigured } from '../../../services/opcua/connectionSecret'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return { connections: await listConnections(useDb()), passwordsStorable: secretKeyConfigured() }
})
