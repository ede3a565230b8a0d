import { idParamsSchema } from '#shared/schemas/fields'
import { sendPasswordLink } from '../../../../services/accounts/passwordLinks'
import { findUser } from '../../../../services/accounts/users'

// Mails a one-time link to choose a new password; the current one works until the link is used.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  await useDb().transaction(async (tx) => {
    const user = await findUser(tx, id)
    if (!user) throw createError({ statusCode: 404, message: `id: user ${id} not found` })
    if (!user.active) throw createError({ statusCode: 409, message: `${user.email} is disabled; enable the account first` })
    await sendPasswordLink(tx, { user, purpose: 'reset', createdBy: admin.id, publicUrl: useRuntimeConfig(event).publicUrl })
    await writeAudit(tx, { userId: admin.id, action: 'user.password-reset', target: user.email, detail: { id, before: null, after: { linkSent: true } }, address: clientAddress(event) })
  })
  setResponseStatus(event, 202)
  return { id, linkSent: true }
})
