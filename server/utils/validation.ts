import type { H3Event } from 'h3'
import type { z } from 'zod'
import { getValidatedQuery, getValidatedRouterParams, readValidatedBody } from 'h3'

/** "samples.3.value: Expected number, received string; name: is required" */
export function describeIssues(error: z.ZodError): string {
  return error.issues.map(i => `${i.path.join('.') || 'body'}: ${i.message}`).join('; ')
}

function badRequest(error: z.ZodError): never {
  refuse(error.issues.map(i => ({ field: i.path.join('.') || 'body', reason: i.message })))
}

function refuse(issues: { field: string, reason: string }[]): never {
  throw createError({
    statusCode: 400,
    message: `Invalid input — ${issues.map(i => `${i.field}: ${i.reason}`).join('; ')}`,
    data: { issues },
  })
}

/** h3's answer to a body that does not parse as JSON (its _parseJSON), which names no field. */
const isUnparsableJson = (err: unknown) =>
  (err as { statusCode?: number })?.statusCode === 400 && (err as Error)?.message === 'Invalid JSON body'

type ValidatedReader = (event: H3Event, validate: (data: unknown) => Promise<unknown>) => Promise<unknown>

// h3's own validated readers answer a failed check with a bare "Validation Error"; these name each
// field in words. The check runs inside h3's reader; its zod error is kept and answered here.
function validWith(read: ValidatedReader) {
  return async <T extends z.ZodTypeAny>(event: H3Event, schema: T): Promise<z.output<T>> => {
    let failure: z.ZodError | undefined
    const check = async (data: unknown) => {
      const result = await schema.safeParseAsync(data)
      if (result.success) return result.data
      failure = result.error
      return false
    }
    return await read(event, check).catch((err: unknown) => {
      if (failure) badRequest(failure)
      if (isUnparsableJson(err)) refuse([{ field: 'body', reason: 'is not valid JSON (cut off, or not JSON at all)' }])
      throw err
    }) as z.output<T>
  }
}

export const validBody = validWith(readValidatedBody as ValidatedReader)
export const validQuery = validWith(getValidatedQuery as ValidatedReader)
export const validParams = validWith(getValidatedRouterParams as ValidatedReader)
