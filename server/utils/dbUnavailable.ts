// Errors that mean "the database cannot be reached right now" rather than "the request is wrong":
// network failures from postgres.js and PostgreSQL's connection/shutdown SQLSTATE classes.
const NETWORK_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EAI_AGAIN',
  'CONNECTION_CLOSED', 'CONNECTION_ENDED', 'CONNECTION_DESTROYED', 'CONNECT_TIMEOUT'])
const SQLSTATE_UNAVAILABLE = /^(08|57P0[1-3]|53300)/

export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e = error as { code?: unknown, cause?: unknown } | undefined, depth = 0; e && depth < 6; e = e.cause as typeof e, depth++) {
    const code = typeof e.code === 'string' ? e.code : ''
    if (NETWORK_CODES.has(code) || SQLSTATE_UNAVAILABLE.test(code)) return true
  }
  return false
}

/**
 * Resolves once the database answers again, trying every `everyMs`. For background work that must
 * record its own failure: a job queue kept in the database cannot note a retry while it is down.
 */
export async function untilDatabaseAnswers(ping: () => Promise<unknown>, everyMs = 5_000): Promise<void> {
  for (;;) {
    try {
      await ping()
      return
    }
    catch (err) {
      if (!isDatabaseUnavailable(err)) throw err
      await new Promise(resolve => setTimeout(resolve, everyMs))
    }
  }
}
