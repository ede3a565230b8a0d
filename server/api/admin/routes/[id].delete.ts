import { idParamsSchema } from '#shared/schemas/fields'
import { deleteRoute } from '../../../services/notifications/routes'

// The route's past messages stay in the outbox (and its delivery log in the audit trail).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  return useDb().transaction(async (tx) => {
    const removed = await deleteRoute(tx, id)
    if (!removed) throw createError({ statusCode: 404, message: `id: route ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'route.delete', target: removed.name, detail: { id, before: removed, after: null }, address: clientAddress(event) })
    return { id, deleted: true }
  })
})
