import { idParamsSchema } from '#shared/schemas/fields'
import { queueRouteTest } from '../../../../services/notifications/routes'

// A test message through the real outbox: the sender task hands it to SMTP like any alarm mail.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const queued = await useDb().transaction(async (tx) => {
    const result = await queueRouteTest(tx, id, user.email)
    if (!result) throw createError({ statusCode: 404, message: `id: route ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'route.test', target: result.route.name, detail: { id, outboxId: result.outboxId, recipients: result.recipients }, address: clientAddress(event) })
    return result
  }).catch(rethrowRouteInput)
  setResponseStatus(event, 202)
  return { id, outboxId: queued.outboxId, recipients: queued.recipients }
})
