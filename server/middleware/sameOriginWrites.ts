import type { H3Event } from 'h3'

/**
 * Cross-site request forgery guard for every state-changing API call (issue 13 item 4).
 *
 * A page on another origin — another port of this host included, which counts as the same
 * *site*, so SameSite=Lax cookies still travel — can make the browser post a form (urlencoded,
 * multipart or text/plain) or a no-cors fetch with the user's cookie. Two checks stop it:
 *
 * 1. The body must be JSON (or, on the upload routes, the CSV file itself): none of these types
 *    can be sent cross-origin without a CORS preflight, which this server never grants.
 * 2. Origin, or Referer when Origin is absent, must be this server's own origin. Browsers send
 *    Origin on every POST/PUT/PATCH/DELETE (Fetch standard, "append a request Origin header";
 *    our Referrer-Policy is same-origin, so our own pages send it in full), and "null" is refused.
 *    A request with neither header does not come from a browser page (a gateway, a script, the
 *    tests) and carries no ambient credentials of a victim, so it passes.
 *
 * The ingest route is authenticated by a gateway key in the Authorization header, which a
 * browser never adds by itself, and reads no cookie: it skips the Origin check (gateways are no
 * web pages), but its body must still be JSON.
 */
const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
const JSON_ONLY = ['application/json']
/** Routes that take a file upload: the CSV bytes as the body (app/composables/useCsvUpload.ts, app/pages/upload.vue, the replay form). */
const BODY_TYPES_BY_ROUTE: Record<string, readonly string[]> = {
  '/api/uploads/preview': ['text/csv'],
  '/api/uploads/import': ['text/csv'],
  '/api/uploads/rejections': ['text/csv'],
  '/api/replays/upload': ['text/csv'],
}
const ORIGIN_CHECK_EXEMPT = new Set(['/api/ingest'])

export default defineEventHandler((event) => {
  if (!STATE_CHANGING.has(event.method) || !event.path.startsWith('/api/')) return
  const route = event.path.split('?')[0]!
  refuseUnlistedBodyType(event, BODY_TYPES_BY_ROUTE[route] ?? JSON_ONLY)
  if (!ORIGIN_CHECK_EXEMPT.has(route)) refuseForeignOrigin(event)
})

function refuseUnlistedBodyType(event: H3Event, allowed: readonly string[]) {
  const declared = getRequestHeader(event, 'content-type')
  const mediaType = declared?.split(';')[0]!.trim().toLowerCase()
  if (mediaType === undefined || mediaType === '') {
    // No type is fine only without a body (an action such as revoke or sign-out).
    if (!hasBody(event)) return
    throw createError({ statusCode: 415, message: `content-type: is required with a body; send ${allowed.join(' or ')}` })
  }
  if (!allowed.includes(mediaType))
    throw createError({ statusCode: 415, message: `content-type: ${mediaType} is not accepted here; send ${allowed.join(' or ')}` })
}

function hasBody(event: H3Event): boolean {
  return Number(getRequestHeader(event, 'content-length') ?? 0) > 0 || getRequestHeader(event, 'transfer-encoding') !== undefined
}

function refuseForeignOrigin(event: H3Event) {
  const origin = getRequestHeader(event, 'origin')
  const referer = getRequestHeader(event, 'referer')
  const claimed = origin ?? (referer === undefined ? undefined : originOf(referer))
  if (claimed === undefined && referer === undefined) return
  const own = ownOrigins(event)
  if (claimed !== undefined && own.includes(claimed)) return
  const header = origin !== undefined ? 'Origin' : 'Referer'
  throw createError({
    statusCode: 403,
    message: `${header}: ${origin ?? referer} is not this server's origin (${own.join(' or ')}); cross-site requests are refused`,
  })
}

/** This server as the browser sees it: the request's own scheme and host (the proxy's when trusted), and the configured public URL. */
function ownOrigins(event: H3Event): string[] {
  const trustProxy = process.env.BRINKLINE_TRUST_PROXY === '1'
  const seen = getRequestURL(event, { xForwardedHost: trustProxy, xForwardedProto: trustProxy }).origin
  const configured = originOf(useRuntimeConfig(event).publicUrl)
  return [...new Set([seen, ...(configured ? [configured] : [])])]
}

function originOf(url: string): string | undefined {
  try {
    const origin = new URL(url).origin
    return origin === 'null' ? undefined : origin
  }
  catch {
    return undefined
  }
}
