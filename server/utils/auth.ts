import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { can, type Capability, type Role } from '#shared/utils/roles'

/** 401 unless signed in with a session that was not signed out; returns the user and session id. */
export async function requireLiveSession(event: H3Event): Promise<{ user: User, id: string | undefined }> {
  const { user, id } = await requireUserSession(event, { message: 'Sign in required' })
  if (id && await isSessionRevoked(useDb(), id)) throw createError({ statusCode: 401, message: 'This session was signed out; sign in again' })
  return { user, id }
}

/** 401 unless signed in. Every protected route starts here or with requireRole. */
export async function requireUser(event: H3Event): Promise<User> {
  return (await requireLiveSession(event)).user
}

/** 401 unless signed in, 403 unless the user's role is one of `roles`. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const user = await requireUser(event)
  if (!roles.includes(user.role))
    throw createError({ statusCode: 403, message: `This needs the ${roles.join(' or ')} role; you are signed in as ${user.role}` })
  return user
}

/** Same as requireRole, phrased by capability (docs/design.md §D2.1). */
export async function requireCapability(event: H3Event, capability: Capability): Promise<User> {
  const user = await requireUser(event)
  if (!can(user.role, capability))
    throw createError({ statusCode: 403, message: `Your role (${user.role}) may not ${capability}` })
  return user
}
