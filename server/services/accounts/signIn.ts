import { and, eq } from 'drizzle-orm'
import { users } from '../../db/schema'
import type { Db } from '../../utils/db'

export async function findActiveUserByEmail(db: Db, email: string) {
  const [user] = await db.select().from(users).where(and(eq(users.email, email), eq(users.active, true)))
  return user
}

export async function markSignedIn(db: Db, userId: number): Promise<void> {
  await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, userId))
}
