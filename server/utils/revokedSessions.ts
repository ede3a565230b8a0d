import { eq, lt } from 'drizzle-orm'
import { revokedSessions } from '../db/schema'

export async function revokeSession(db: Db, sessionId: string, maxAgeSeconds: number): Promise<void> {
  await db.insert(revokedSessions).values({ sessionId }).onConflictDoNothing()
  // A revoked id only matters while its cookie could still be within its lifetime.
  await db.delete(revokedSessions).where(lt(revokedSessions.revokedAt, new Date(Date.now() - maxAgeSeconds * 1000)))
}

export async function isSessionRevoked(db: Db, sessionId: string): Promise<boolean> {
  const [row] = await db.select({ id: revokedSessions.sessionId }).from(revokedSessions).where(eq(revokedSessions.sessionId, sessionId))
  return !!row
}
