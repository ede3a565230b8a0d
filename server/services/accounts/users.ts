import { and, asc, eq, sql } from 'drizzle-orm'
import type { UserCreate, UserUpdate } from '../../../shared/schemas/account'
import { users } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'
import { endSessions } from './accountState'

export const USER_COLUMNS = {
  id: users.id, email: users.email, name: users.name, role: users.role, active: users.active,
  createdAt: users.createdAt, lastSignInAt: users.lastSignInAt, sessionsValidAfter: users.sessionsValidAfter,
}

// Invited and not yet followed the link: known without ever reading the hash out.
const invited = sql<boolean>`${users.passwordHash} is null`

export function listUsers(db: DbExecutor) {
  return db.select({ ...USER_COLUMNS, invited }).from(users).orderBy(asc(users.email))
}

export type UserView = Awaited<ReturnType<typeof listUsers>>[number]

export class AccountConflict extends Error {}

/** A new account without a password; the caller sends its set-password link in the same transaction. */
export async function createUser(tx: DbExecutor, input: UserCreate) {
  const [row] = await tx.insert(users).values({ ...input, passwordHash: null }).onConflictDoNothing().returning(USER_COLUMNS)
  if (!row) throw new AccountConflict(`email: an account for ${input.email} already exists`)
  return row
}

/**
 * Changes name, role or active. The active admins are locked first (FOR UPDATE), so two admins
 * demoting each other at once cannot leave none. Disabling or a role change ends the user's
 * sessions. Returns the row before and after, for the audit record.
 */
export async function updateUser(tx: DbExecutor, id: number, change: UserUpdate) {
  const admins = await tx.select({ id: users.id }).from(users)
    .where(and(eq(users.role, 'admin'), eq(users.active, true))).orderBy(asc(users.id)).for('update')
  const [before] = await tx.select(USER_COLUMNS).from(users).where(eq(users.id, id)).for('update')
  if (!before) return null
  const losesAdmin = before.role === 'admin' && before.active
    && ((change.role !== undefined && change.role !== 'admin') || change.active === false)
  if (losesAdmin && admins.length <= 1)
    throw new AccountConflict(`${before.email} is the last active admin; make another user admin first`)
  const [after] = await tx.update(users).set(change).where(eq(users.id, id)).returning(USER_COLUMNS)
  const accessChanged = (change.role !== undefined && change.role !== before.role) || (change.active === false && before.active)
  if (accessChanged) await endSessions(tx, id)
  return { before, after: accessChanged ? { ...after!, sessionsValidAfter: new Date() } : after! }
}

export async function findUser(db: DbExecutor, id: number) {
  const [row] = await db.select(USER_COLUMNS).from(users).where(eq(users.id, id))
  return row
}
