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

// h3-zod's throwing variants answer with a raw issue dump; these name each field in words.
export async function validBody<T extends z.ZodTypeAny>(event: H3Event, schema: T): Promise<z.output<T>> {
  const result = await useSafeValidatedBody(event, schema as never) as z.SafeParseReturnType<unknown, z.output<T>>
  return result.success ? result.data : badRequest(result.error)
}

export async function validQuery<T extends z.ZodTypeAny>(event: H3Event, schema: T): Promise<z.output<T>> {
  const result = await useSafeValidatedQuery(event, schema as never) as z.SafeParseReturnType<unknown, z.output<T>>
  return result.success ? result.data : badRequest(result.error)
}

export async function validParams<T extends z.ZodTypeAny>(event: H3Event, schema: T): Promise<z.output<T>> {
  const result = await useSafeValidatedParams(event, schema as never) as z.SafeParseReturnType<unknown, z.output<T>>
  return result.success ? result.data : badRequest(result.error)
}
