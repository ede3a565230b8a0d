import { createError } from 'h3'
// Plain errors of the supervisor's review; routes turn them into HTTP answers with reviewHttpError.

/** A named field that points at nothing, or at something the request may not combine. */
export class ReviewInputError extends Error {
  constructor(readonly field: string, readonly statusCode: 400 | 404 | 409, message: string) {
    super(`${field}: ${message}`)
  }
}

/** ReviewInputError → its status naming the field; anything else is left alone. */
export function reviewHttpError(err: unknown): unknown {
  if (err instanceof ReviewInputError)
    return createError({ statusCode: err.statusCode, message: err.message, data: { issues: [{ field: err.field, reason: err.message }] } })
  return err
}
