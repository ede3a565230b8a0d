/**
 * Polls until `check` returns a value other than undefined. Generous by default: the machine may
 * be loaded, and nothing here is a speed claim.
 */
export async function eventually<T>(what: string, check: () => Promise<T | undefined>, timeoutMs = 120_000): Promise<T> {
  const until = Date.now() + timeoutMs
  let last: unknown
  while (Date.now() < until) {
    try {
      const result = await check()
      if (result !== undefined) return result
    }
    catch (err) {
      last = err
    }
    await new Promise(resolve => setTimeout(resolve, 250))
  }
  throw new Error(`timed out waiting for ${what}${last ? `: ${(last as Error).message}` : ''}`)
}
