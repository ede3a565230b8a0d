import type { z } from 'zod'

/**
 * A form's submit: check the input against the shared zod contract first (the same one the route
 * uses), then send it; either failure becomes one readable message that names the fields.
 * Resolves true when the server accepted it.
 */
export function useValidatedSubmit<S extends z.ZodTypeAny>(schema: S, send: (data: z.output<S>) => Promise<unknown>, fallback: string) {
  const error = ref('')
  const busy = ref(false)
  async function submit(input: z.input<S>): Promise<boolean> {
    const parsed = schema.safeParse(input)
    if (!parsed.success) {
      error.value = parsed.error.issues.map(i => `${i.path.join('.')}: ${i.message}`).join('; ')
      return false
    }
    busy.value = true
    error.value = ''
    try {
      await send(parsed.data)
      return true
    }
    catch (err) {
      error.value = errorMessage(err, fallback)
      return false
    }
    finally {
      busy.value = false
    }
  }
  return { error, busy, submit }
}
