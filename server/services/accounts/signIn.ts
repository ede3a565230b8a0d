import { and, eq, gt, lt, or, sql } from 'drizzle-orm'
import { signInFailures, users } from '../../db/schema'
import type { Db } from '../../utils/db'

export async function signInBlocked(db: Db, email: string, address: string): Promise<boolean> {
  const since = new Date(Date.now() - SIGN_IN_LIMITS.windowMinutes * 60_000)
  // Both counts in one pass over the window's failures.
  const [counts] = await db.select({
    byAccount: sql<number>`count(*) filter (where ${signInFailures.email} = ${email})`.mapWith(Number),
    byAddress: sql<number>`count(*) filter (where ${signInFailures.address} = ${address})`.mapWith(Number),
  }).from(signInFailures)
    .where(and(gt(signInFailures.at, since), or(eq(signInFailures.email, email), eq(signInFailures.address, address))))
  return counts!.byAccount >= SIGN_IN_LIMITS.perAccount || counts!.byAddress >= SIGN_IN_LIMITS.perAddress
}

export async function recordSignInFailure(db: Db, email: string, address: string): Promise<void> {
  await db.insert(signInFailures).values({ email, address })
  // Keep the table small: failures older than a day no longer matter.
  await db.delete(signInFailures).where(lt(signInFailures.at, new Date(Date.now() - 86_400_000)))
}

export async function findActiveUserByEmail(db: Db, email: string) {
  const [user] = await db.select().from(users).where(and(eq(users.email, email), eq(users.active, true)))
  return user
}

export async function markSignedIn(db: Db, userId: number, email: string): Promise<void> {
  await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, userId))
  await db.delete(signInFailures).where(eq(signInFailures.email, email))
}

// [common practice] Lock out brute force per account and per source address, over a sliding
// window, without locking a whole control room out because one person mistypes.
export const SIGN_IN_LIMITS: Readonly<{ windowMinutes: number, perAccount: number, perAddress: number }> = { windowMinutes: 15, perAccount: 5, perAddress: 20 }
