import { schemaReady } from '../plugins/0.migrate'
import { isDatabaseUnavailable } from './dbUnavailable'

/** Tasks whose last scheduled run found the database unreachable (this instance). */
const waitingForDatabase = new Set<string>()

/**
 * A task's work, once this instance's migrations are done. While the database cannot be reached, a
 * scheduled run says so in one log line per task and outage and returns; the next run tries again.
 * Left to nitro, every failed run printed its whole stack: a three-minute outage wrote some 800
 * lines. Runs asked for by hand (the test-only task route) still throw, so their caller sees why.
 */
export async function scheduledWork<T>(
  task: string, payload: { scheduledTime?: unknown }, work: () => Promise<T>,
): Promise<{ result: T | string }> {
  try {
    await schemaReady()
    const result = await work()
    if (waitingForDatabase.delete(task)) console.warn(`[task] ${task}: the database answers again`)
    return { result }
  }
  catch (err) {
    if (!payload.scheduledTime || !isDatabaseUnavailable(err)) throw err
    if (!waitingForDatabase.has(task)) {
      waitingForDatabase.add(task)
      console.error(`[task] ${task}: database unavailable (${rootMessage(err)}); trying again at each scheduled run`)
    }
    return { result: 'database unavailable' }
  }
}

/** The innermost cause's message: "connect ECONNREFUSED …", not the failed query's text. */
function rootMessage(err: unknown): string {
  let e = err as { message?: string, cause?: unknown }
  for (let depth = 0; e.cause && depth < 6; depth++) e = e.cause as typeof e
  return e.message ?? String(err)
}
