import { randomBytes } from 'node:crypto'
import { and, eq } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { normalisePassword } from '#shared/schemas/account'
import { users } from '../../db/schema'
import type { Db } from '../../utils/db'
import { writeAudit } from '../../utils/audit'
import type { PasswordHashing } from './passwordHashing'
import type { SignInLimiter } from './signInLimits'

/** What a sign-in needs from outside: the limiter of this process and the server's password hashing. */
export interface SignInTools extends PasswordHashing {
  limiter: SignInLimiter
}

export interface SignInAttempt {
  email: string
  password: string
  address: string
}

export type SignInOutcome =
  | { signedIn: true, user: User }
  | { signedIn: false, statusCode: 429, retryAfterS: number, message: string }
  | { signedIn: false, statusCode: 401, message: string }

/**
 * One sign-in attempt: reserved on the limiter before its password is checked, one scrypt check
 * whether or not the account exists, one audit row whatever the answer. The session itself is the
 * route's (it needs the request).
 */
export async function signIn(db: Db, attempt: SignInAttempt, tools: SignInTools): Promise<SignInOutcome> {
  const { email, address } = attempt
  const reservation = await tools.limiter.reserve(email, address)
  if (!reservation.allowed) {
    await writeAudit(db, { userId: null, action: 'sign-in.limited', target: email, address, detail: { limit: reservation.limit } })
    const message = `Too many ${reservation.limit}; try again in ${reservation.retryAfterS} s`
    return { signedIn: false, statusCode: 429, retryAfterS: reservation.retryAfterS, message }
  }
  const user = await findActiveUserByEmail(db, email)
  // Always one scrypt check, against a dummy hash for an unknown account: equal work, equal time.
  const hash = user?.passwordHash ?? await hashForUnknownAccount(tools.hashPassword)
  const passwordOk = await tools.verifyPassword(hash, normalisePassword(attempt.password))
  if (!user?.passwordHash || !passwordOk) {
    await reservation.settle(false)
    await writeAudit(db, { userId: user?.id ?? null, action: 'sign-in.failed', target: email, address })
    // Same answer for unknown account and wrong password: don't reveal which accounts exist.
    return { signedIn: false, statusCode: 401, message: 'E-mail or password is wrong' }
  }
  await reservation.settle(true)
  await markSignedIn(db, user.id)
  await writeAudit(db, { userId: user.id, action: 'sign-in', target: email, address })
  return { signedIn: true, user: { id: user.id, email: user.email, name: user.name, role: user.role } }
}

let unknownAccountHash: Promise<string> | undefined
/**
 * A hash of a random password, checked when the e-mail names no account, so an unknown account
 * costs the same scrypt work as a wrong password and answer times do not tell which exist
 * (OWASP Authentication Cheat Sheet, "authentication responses").
 */
function hashForUnknownAccount(hashPassword: PasswordHashing['hashPassword']): Promise<string> {
  unknownAccountHash ??= hashPassword(randomBytes(24).toString('base64url'))
  return unknownAccountHash
}

async function findActiveUserByEmail(db: Db, email: string) {
  const [user] = await db.select().from(users).where(and(eq(users.email, email), eq(users.active, true)))
  return user
}

async function markSignedIn(db: Db, userId: number): Promise<void> {
  await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, userId))
}
