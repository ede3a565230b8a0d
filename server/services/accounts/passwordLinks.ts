import { createHash, randomBytes } from 'node:crypto'
import { and, eq, gt, isNull } from 'drizzle-orm'
import { passwordLinkMail, type PasswordLinkPurpose } from '../../../shared/notifications/accountMail'
import { notificationOutbox, passwordTokens, users } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'

// [common practice] An invitation waits two days for a new colleague; a reset link is short-lived
// (OWASP Forgot Password Cheat Sheet: tokens single-use and expiring after a short period).
export const LINK_LIFETIME_HOURS: Record<PasswordLinkPurpose, number> = { invite: 48, reset: 1 }

const digest = (token: string) => createHash('sha256').update(token).digest('hex')

/**
 * Issues a one-time link and writes its mail into the outbox, in the caller's transaction: the
 * link exists exactly when its mail does. Earlier unused links of the user stop working.
 * The token (256 random bits) is never stored; only its digest is.
 */
export async function sendPasswordLink(tx: DbExecutor, input: {
  user: { id: number, email: string, name: string }
  purpose: PasswordLinkPurpose
  createdBy: number
  publicUrl: string
}): Promise<void> {
  const token = randomBytes(32).toString('base64url')
  const hours = LINK_LIFETIME_HOURS[input.purpose]
  await tx.update(passwordTokens).set({ usedAt: new Date() })
    .where(and(eq(passwordTokens.userId, input.user.id), isNull(passwordTokens.usedAt)))
  await tx.insert(passwordTokens).values({
    userId: input.user.id, tokenHash: digest(token), purpose: input.purpose, createdBy: input.createdBy,
    expiresAt: new Date(Date.now() + hours * 3_600_000),
  })
  const link = `${input.publicUrl.replace(/\/$/, '')}/set-password?token=${token}`
  const mail = passwordLinkMail({ purpose: input.purpose, name: input.user.name, link, expiresInHours: hours })
  await tx.insert(notificationOutbox).values({ kind: 'account', recipients: [input.user.email], subject: mail.subject, body: mail.text })
}

/**
 * Uses a link: claims it (once — the UPDATE … WHERE used_at IS NULL is the single winner of two
 * concurrent uses), sets the password and ends the user's other sessions. Returns the user, or
 * null for an unknown, used or expired link.
 */
export async function usePasswordLink(tx: DbExecutor, token: string, passwordHash: string) {
  const [claimed] = await tx.update(passwordTokens).set({ usedAt: new Date() })
    .where(and(eq(passwordTokens.tokenHash, digest(token)), isNull(passwordTokens.usedAt), gt(passwordTokens.expiresAt, new Date())))
    .returning({ userId: passwordTokens.userId, purpose: passwordTokens.purpose })
  if (!claimed) return null
  const [user] = await tx.update(users).set({ passwordHash, sessionsValidAfter: new Date() })
    .where(and(eq(users.id, claimed.userId), eq(users.active, true)))
    .returning({ id: users.id, email: users.email })
  return user ? { ...user, purpose: claimed.purpose } : null
}

/** The user a still-valid link belongs to (so the page can greet them), or null. */
export async function passwordLinkOwner(db: DbExecutor, token: string) {
  const [row] = await db.select({ email: users.email, name: users.name, purpose: passwordTokens.purpose }).from(passwordTokens)
    .innerJoin(users, eq(users.id, passwordTokens.userId))
    .where(and(
      eq(passwordTokens.tokenHash, digest(token)),
      isNull(passwordTokens.usedAt),
      gt(passwordTokens.expiresAt, new Date()),
      eq(users.active, true),
    ))
  return row ?? null
}
