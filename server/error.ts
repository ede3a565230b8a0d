import { STATUS_CODES } from 'node:http'
import type { NitroErrorHandler } from 'nitropack'
import { isDatabaseUnavailable } from './utils/dbUnavailable'

// A database outage is a temporary condition, not a bug: answer 503 with Retry-After so gateways
// back off and retry, instead of a 500. Anything else falls through to Nuxt's error handler.
const handler: NitroErrorHandler = (error, event) => {
  if (!isDatabaseUnavailable(error)) {
    // Nitro names every error without a status text of its own "Server Error", a 400 included;
    // a client's mistake gets its standard reason phrase, and the message names the field.
    if (error.statusCode && error.statusCode < 500 && !error.statusMessage) error.statusMessage = STATUS_CODES[error.statusCode] ?? 'Request refused'
    return
  }
  console.error('[db] unavailable:', (error.cause as Error | undefined)?.message ?? error.message)
  event.node.res.statusCode = 503
  event.node.res.setHeader('Retry-After', '5')
  event.node.res.setHeader('Content-Type', 'application/json')
  event.node.res.end(JSON.stringify({ statusCode: 503, message: 'Database unavailable, retry later' }))
  // h3 reads event.handled from the response state.
  ;(event as unknown as { _handled: boolean })._handled = true
}

export default handler
