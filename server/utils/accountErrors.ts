import { AccountConflict } from '../services/accounts/users'

/** An AccountConflict (duplicate address, last admin) answers 409 with its message. */
export function rethrowAccountConflict(err: unknown): never {
  if (err instanceof AccountConflict) throw createError({ statusCode: 409, message: err.message })
  throw err
}
