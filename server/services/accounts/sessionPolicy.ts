import type { Role } from '../../../shared/utils/roles'

/** What a request needs to know of the account behind a session (read per request, cached briefly). */
export interface AccountState {
  active: boolean
  role: Role
  /** Epoch ms; sessions signed in before it are ended (end all sessions, password set, role change). */
  sessionsValidAfter: number | null
}

export interface SessionFacts {
  role: Role
  /** Epoch ms of sign-in. */
  loggedInAt: number
  /** Epoch ms of the session's last request (sign-in time for a session that made none). */
  lastSeenAt: number
}

/**
 * Why this session may no longer be used, or null. A session follows its account: a disabled
 * account, a changed role or an "end all sessions" ends it on the next request, and so does
 * `idleMs` without a request (NIST SP 800-63B-4 §2.2.3 [from memory]: at AAL2 reauthenticate
 * after 30 minutes of inactivity and at least every 12 hours — the absolute limit is the cookie's
 * maxAge, checked before this).
 */
export function sessionRefusal(session: SessionFacts, account: AccountState | undefined, now: number, idleMs: number): string | null {
  if (!account) return 'This account no longer exists; sign in again'
  if (!account.active) return 'This account has been disabled; ask an administrator'
  if (account.role !== session.role) return `Your role changed to ${account.role}; sign in again`
  if (account.sessionsValidAfter !== null && session.loggedInAt < account.sessionsValidAfter)
    return 'This session was ended; sign in again'
  if (now - session.lastSeenAt > idleMs)
    return `Signed out after ${Math.round(idleMs / 60_000)} minutes without activity; sign in again`
  return null
}

/** Refresh the cookie's last-seen time at most this often: a new cookie per request is waste. */
export const LAST_SEEN_REFRESH_MS = 60_000
