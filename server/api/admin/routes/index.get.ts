import { listRoutes } from '../../../services/notifications/routes'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return listRoutes(useDb())
})
