import { userCreateSchema } from '#shared/schemas/account'
import { sendPasswordLink } from '../../../services/accounts/passwordLinks'
import { createUser } from '../../../services/accounts/users'

// Creates an account without a password and mails its one-time set-password link (outbox).
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const input = await validBody(event, userCreateSchema)
  const user = await useDb().transaction(async (tx) => {
    const created = await createUser(tx, input)
    await sendPasswordLink(tx, { user: created, purpose: 'invite', createdBy: admin.id, publicUrl: useRuntimeConfig(event).publicUrl })
    await writeAudit(tx, { userId: admin.id, action: 'user.create', target: created.email, detail: { id: created.id, before: null, after: input }, address: clientAddress(event) })
    return created
  }).catch(rethrowAccountConflict)
  setResponseStatus(event, 201)
  return user
})
