import { idParamsSchema } from '#shared/schemas/fields'
import { routeUpdateSchema } from '#shared/schemas/notificationRoute'
import { updateRoute } from '../../../services/notifications/routes'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const change = await validBody(event, routeUpdateSchema)
  return useDb().transaction(async (tx) => {
    const changed = await updateRoute(tx, id, change)
    if (!changed) throw createError({ statusCode: 404, message: `id: route ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'route.update', target: changed.after.name, detail: { id, before: changed.before, after: changed.after }, address: clientAddress(event) })
    return changed.after
  }).catch(rethrowRouteInput)
})
