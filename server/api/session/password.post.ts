import { eq } from 'drizzle-orm'
import { changePasswordSchema, normalisePassword } from '#shared/schemas/account'
import { users } from '../../db/schema'
import { endSessions, forgetAccountState } from '../../services/accounts/accountState'

// A signed-in user changes their own password (the current one is required). Other sessions end;
// this one is renewed so the user stays signed in here.
export default defineEventHandler(async (event) => {
  const { user } = await requireLiveSession(event)
  const { currentPassword, newPassword } = await validBody(event, changePasswordSchema)
  const db = useDb()
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, user.id))
  if (!row?.passwordHash || !(await verifyPassword(row.passwordHash, normalisePassword(currentPassword)))) {
    await writeAudit(db, { userId: user.id, action: 'user.password-change-refused', target: user.email, address: clientAddress(event) })
    throw createError({ statusCode: 403, message: 'currentPassword: is not your current password' })
  }
  requireAcceptablePassword(newPassword, user.email, 'newPassword')
  const hash = await hashPassword(normalisePassword(newPassword))
  const at = new Date()
  await db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash: hash }).where(eq(users.id, user.id))
    await endSessions(tx, user.id, at)
    await writeAudit(tx, { userId: user.id, action: 'user.password-change', target: user.email, address: clientAddress(event) })
  })
  forgetAccountState(user.id)
  // A fresh sign-in time after the cut-off keeps this browser signed in.
  const now = at.getTime() + 1
  await setUserSession(event, { user, loggedInAt: now, lastSeenAt: now })
  return { passwordChanged: true }
})
