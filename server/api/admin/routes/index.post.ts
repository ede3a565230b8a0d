import { routeCreateSchema } from '#shared/schemas/notificationRoute'
import { createRoute } from '../../../services/notifications/routes'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const input = await validBody(event, routeCreateSchema)
  const route = await useDb().transaction(async (tx) => {
    const created = await createRoute(tx, input)
    await writeAudit(tx, { userId: user.id, action: 'route.create', target: created.name, detail: { id: created.id, before: null, after: created }, address: clientAddress(event) })
    return created
  }).catch(rethrowRouteInput)
  setResponseStatus(event, 201)
  return route
})
