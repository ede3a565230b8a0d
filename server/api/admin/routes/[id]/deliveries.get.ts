import { idParamsSchema } from '#shared/schemas/fields'
import { routeDeliveries } from '../../../../services/notifications/routes'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  return routeDeliveries(useDb(), id)
})
