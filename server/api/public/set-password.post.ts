import { normalisePassword, setPasswordSchema } from '#shared/schemas/account'
import { forgetAccountState } from '../../services/accounts/accountState'
import { passwordLinkOwner, usePasswordLink } from '../../services/accounts/passwordLinks'

// Follows a one-time link: sets the password, ends any earlier sessions. The link works once.
export default defineEventHandler(async (event) => {
  const { token, password } = await validBody(event, setPasswordSchema)
  const db = useDb()
  const gone = () => createError({ statusCode: 410, message: 'token: this link has been used or has expired; ask an administrator for a new one' })
  const owner = await passwordLinkOwner(db, token)
  if (!owner) throw gone()
  requireAcceptablePassword(password, owner.email, 'password')
  const hash = await hashPassword(normalisePassword(password))
  const user = await db.transaction(async (tx) => {
    const used = await usePasswordLink(tx, token, hash)
    if (!used) throw gone()
    await writeAudit(tx, { userId: used.id, action: used.purpose === 'invite' ? 'user.password-set' : 'user.password-reset-used', target: used.email, address: clientAddress(event) })
    return used
  })
  forgetAccountState(user.id)
  return { email: user.email, passwordSet: true }
})
