import type { H3Event } from 'h3'
import type { z } from 'zod'
import { getValidatedQuery, getValidatedRouterParams, readValidatedBody } from 'h3'

/** "samples.3.value: Expected number, received string; name: is required" */
export function describeIssues(error: z.ZodError): string {
  return error.issues.map(i => `${i.path.join('.') || 'body'}: ${i.message}`).join('; ')
}

function badRequest(error: z.ZodError): never {
  throw createError({
    statusCode: 400,
    message: `Invalid input — ${describeIssues(error)}`,
    data: { issues: error.issues.map(i => ({ field: i.path.join('.'), reason: i.message })) },
  })
}

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
    return await read(event, check).catch((err: unknown) => (failure ? badRequest(failure) : Promise.reject(err))) as z.output<T>
  }
}

export const validBody = validWith(readValidatedBody as ValidatedReader)
export const validQuery = validWith(getValidatedQuery as ValidatedReader)
export const validParams = validWith(getValidatedRouterParams as ValidatedReader)
