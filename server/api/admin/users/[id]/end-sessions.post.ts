import { idParamsSchema } from '#shared/schemas/fields'
import { endSessions, forgetAccountState } from '../../../../services/accounts/accountState'
import { findUser } from '../../../../services/accounts/users'

// Every session of the user signed in before now ends on its next request.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const at = new Date()
  await useDb().transaction(async (tx) => {
    const user = await findUser(tx, id)
    if (!user) throw createError({ statusCode: 404, message: `id: user ${id} not found` })
    await endSessions(tx, id, at)
    await writeAudit(tx, { userId: admin.id, action: 'user.end-sessions', target: user.email, detail: { id, before: { sessionsValidAfter: user.sessionsValidAfter }, after: { sessionsValidAfter: at } }, address: clientAddress(event) })
  })
  forgetAccountState(id)
  return { id, sessionsValidAfter: at }
})
