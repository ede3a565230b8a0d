import { idParamsSchema } from '#shared/schemas/fields'
import { userUpdateSchema } from '#shared/schemas/account'
import { forgetAccountState } from '../../../services/accounts/accountState'
import { updateUser } from '../../../services/accounts/users'

// Rename, change role, disable or re-enable. Disabling or a role change ends the user's sessions.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const change = await validBody(event, userUpdateSchema)
  const result = await useDb().transaction(async (tx) => {
    const changed = await updateUser(tx, id, change)
    if (!changed) throw createError({ statusCode: 404, message: `id: user ${id} not found` })
    await writeAudit(tx, { userId: admin.id, action: 'user.update', target: changed.before.email, detail: { id, before: changed.before, after: changed.after }, address: clientAddress(event) })
    return changed
  }).catch(rethrowAccountConflict)
  forgetAccountState(id)
  return result.after
})
