import { eq } from 'drizzle-orm'
import type { Db, DbExecutor } from '../../utils/db'
import { users } from '../../db/schema'
import type { AccountState } from './sessionPolicy'

// Each request reads its account's state; this keeps the answer for a few seconds per instance
// so a page's burst of calls costs one query. A change made on this instance clears the entry at
// once; another instance sees it within CACHE_MS.
const CACHE_MS = 5_000
const cache = new Map<number, { state: AccountState | undefined, until: number }>()

export async function accountState(db: Db, userId: number, now = Date.now()): Promise<AccountState | undefined> {
  const hit = cache.get(userId)
  if (hit && hit.until > now) return hit.state
  const [row] = await db.select({ active: users.active, role: users.role, sessionsValidAfter: users.sessionsValidAfter })
    .from(users).where(eq(users.id, userId))
  const state = row && { active: row.active, role: row.role, sessionsValidAfter: row.sessionsValidAfter?.getTime() ?? null }
  if (cache.size > 10_000) cache.clear()
  cache.set(userId, { state, until: now + CACHE_MS })
  return state
}

export function forgetAccountState(userId: number): void {
  cache.delete(userId)
}

/** Ends every session of the user signed in before now; runs in the caller's transaction. */
export async function endSessions(db: DbExecutor, userId: number, at = new Date()): Promise<void> {
  await db.update(users).set({ sessionsValidAfter: at }).where(eq(users.id, userId))
  forgetAccountState(userId)
}
