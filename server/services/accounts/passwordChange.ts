import { eq } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { normalisePassword } from '#shared/schemas/account'
import { users } from '../../db/schema'
import type { Db } from '../../utils/db'
import { writeAudit } from '../../utils/audit'
import { requireAcceptablePassword } from '../../utils/passwordCheck'
import { endSessions, forgetAccountState } from './accountState'
import type { PasswordHashing } from './passwordHashing'

/** `at`: the cut-off before which the account's sessions ended. */
export type PasswordChangeOutcome = { changed: true, at: Date } | { changed: false, statusCode: 403, message: string }

/**
 * A signed-in user's own password change: the current password first (a refusal is audited),
 * then the new one's checks (a 400 naming `newPassword`), then the new hash, every session of the
 * account ended and the audit row in one transaction. The route renews its own session.
 */
export async function changeOwnPassword(
  db: Db, change: { user: User, currentPassword: string, newPassword: string, address: string },
  tools: PasswordHashing,
): Promise<PasswordChangeOutcome> {
  const { user, address } = change
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, user.id))
  if (!row?.passwordHash || !(await tools.verifyPassword(row.passwordHash, normalisePassword(change.currentPassword)))) {
    await writeAudit(db, { userId: user.id, action: 'user.password-change-refused', target: user.email, address })
    return { changed: false, statusCode: 403, message: 'currentPassword: is not your current password' }
  }
  requireAcceptablePassword(change.newPassword, user.email, 'newPassword')
  const hash = await tools.hashPassword(normalisePassword(change.newPassword))
  const at = new Date()
  await db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash: hash }).where(eq(users.id, user.id))
    await endSessions(tx, user.id, at)
    await writeAudit(tx, { userId: user.id, action: 'user.password-change', target: user.email, address })
  })
  forgetAccountState(user.id)
  return { changed: true, at }
}
