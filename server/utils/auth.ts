import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { can, type Capability, type Role } from '#shared/utils/roles'
import { accountState } from '../services/accounts/accountState'
import { LAST_SEEN_REFRESH_MS, sessionRefusal } from '../services/accounts/sessionPolicy'

/** Inactivity after which a session ends (NUXT_SESSION_IDLE_MINUTES; 30 by default). */
export const sessionIdleMs = () => Number(useRuntimeConfig().sessionIdleMinutes) * 60_000

/**
 * 401 unless signed in with a session that was not signed out and whose account still allows it
 * (active, same role, not ended, not idle). Returns the user and session id.
 */
export async function requireLiveSession(event: H3Event): Promise<{ user: User, id: string | undefined }> {
  const session = await requireUserSession(event, { message: 'Sign in required' })
  const { user, id } = session
  const db = useDb()
  if (id && await isSessionRevoked(db, id)) throw createError({ statusCode: 401, message: 'This session was signed out; sign in again' })
  await refuseStaleSession(event, session)
  return { user, id }
}

/** Ends the session (cookie cleared) with a 401 if its account no longer allows it; else marks it seen. */
export async function refuseStaleSession(event: H3Event, session: { user: User, loggedInAt?: number, lastSeenAt?: number }): Promise<void> {
  const now = Date.now()
  const loggedInAt = Number(session.loggedInAt ?? 0)
  const lastSeenAt = Number(session.lastSeenAt ?? loggedInAt)
  const idleMs = sessionIdleMs()
  const account = await accountState(useDb(), session.user.id, now)
  const refusal = sessionRefusal({ role: session.user.role, loggedInAt, lastSeenAt }, account, now, idleMs)
  if (refusal) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: refusal })
  }
  if (now - lastSeenAt > Math.min(LAST_SEEN_REFRESH_MS, idleMs / 4)) await setUserSession(event, { lastSeenAt: now })
}

/** 401 unless signed in. Every protected route starts here or with requireRole. */
export async function requireUser(event: H3Event): Promise<User> {
  return (await requireLiveSession(event)).user
}

/**
 * A refused action goes into the audit log (who, which route, from where) before its 403, so an
 * admin can see attempts beyond a role, not only what was done. A signed-in user is attributable,
 * so the row cannot be written anonymously at will. If the log cannot be written the 403 still
 * stands (the refusal matters more than its record), and the failure is logged.
 */
async function refuse(event: H3Event, user: User, message: string): Promise<never> {
  await writeAudit(useDb(), {
    userId: user.id, action: 'access.refused', target: `${event.method} ${event.path.split('?')[0]}`,
    address: clientAddress(event), detail: { role: user.role, reason: message },
  }).catch((err: Error) => console.error(`[audit] a refused ${event.method} ${event.path} was not recorded: ${err.message}`))
  throw createError({ statusCode: 403, message })
}

/** 401 unless signed in, 403 unless the user's role is one of `roles`. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const user = await requireUser(event)
  if (!roles.includes(user.role)) await refuse(event, user, `This needs the ${roles.join(' or ')} role; you are signed in as ${user.role}`)
  return user
}

/** Same as requireRole, phrased by capability (docs/design.md §D2.1). */
export async function requireCapability(event: H3Event, capability: Capability): Promise<User> {
  const user = await requireUser(event)
  if (!can(user.role, capability)) await refuse(event, user, `Your role (${user.role}) may not ${capability}`)
  return user
}

/**
 * Signs in with a new session and a new session id. The session is not merged into whatever the
 * browser carried (its old last-seen time included), and its id is not kept either: h3 reads the
 * id back from the request's cookie after a clear, so a browser that still sent a signed-out
 * session would get that revoked id again and read "signed out" at once. A new id at sign-in is
 * also the rule against session fixation (OWASP Session Management Cheat Sheet).
 */
export async function startFreshSession(event: H3Event, data: Parameters<typeof replaceUserSession>[1]): Promise<void> {
  const name = (useRuntimeConfig(event).session as { name?: string }).name ?? 'nuxt-session'
  const cookie = event.node.req.headers.cookie
  if (cookie) {
    event.node.req.headers.cookie = cookie.split(';').filter(part => part.split('=')[0]!.trim() !== name).join(';')
  }
  await replaceUserSession(event, data)
}
