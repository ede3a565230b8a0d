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
