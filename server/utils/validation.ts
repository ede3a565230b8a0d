import type { H3Event } from 'h3'
import type { z } from 'zod'
import { useSafeValidatedBody, useSafeValidatedParams, useSafeValidatedQuery } from 'h3-zod'

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

type SafeReader = (event: H3Event, schema: never) => Promise<unknown>

// h3-zod's throwing variants answer with a raw issue dump; these name each field in words.
function validWith(read: SafeReader) {
  return async <T extends z.ZodTypeAny>(event: H3Event, schema: T): Promise<z.output<T>> => {
    const result = await read(event, schema as never) as z.SafeParseReturnType<unknown, z.output<T>>
    return result.success ? result.data : badRequest(result.error)
  }
}

export const validBody = validWith(useSafeValidatedBody as SafeReader)
export const validQuery = validWith(useSafeValidatedQuery as SafeReader)
export const validParams = validWith(useSafeValidatedParams as SafeReader)
