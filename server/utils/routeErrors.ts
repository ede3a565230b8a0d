import { RouteInputError } from '../services/notifications/routes'

/** A RouteInputError (unit of another site, missing recipient) answers 400 naming its field. */
export function rethrowRouteInput(err: unknown): never {
  if (err instanceof RouteInputError) throw createError({ statusCode: 400, message: `Invalid input — ${err.message}` })
  throw err
}
