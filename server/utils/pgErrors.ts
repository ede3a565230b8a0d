/** The SQLSTATE of a PostgreSQL error, whether drizzle wrapped it or not. */
export function sqlState(err: unknown): string | undefined {
  const e = err as { code?: string, cause?: { code?: string } }
  return e?.code ?? e?.cause?.code
}
export const UNIQUE_VIOLATION = '23505'
export const FOREIGN_KEY_VIOLATION = '23503'

/**
 * The one mapping of constraint errors to answers: a unique violation becomes 409 and a missing
 * referenced row 400, each with the caller's message naming the field. Anything else comes back
 * as it was, for the caller to throw.
 */
export function constraintHttpError(err: unknown, messages: { duplicate?: string, missingReference?: string }): unknown {
  const state = sqlState(err)
  if (state === UNIQUE_VIOLATION && messages.duplicate) return createError({ statusCode: 409, message: messages.duplicate })
  if (state === FOREIGN_KEY_VIOLATION && messages.missingReference) return createError({
    statusCode: 400, message: messages.missingReference,
  })
  return err
}
