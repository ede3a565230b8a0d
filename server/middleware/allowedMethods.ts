import apiRoutes from '#brinkline/api-routes'

/**
 * 405 Method Not Allowed, with Allow, when a path under /api exists but not for this method
 * (RFC 9110 §15.5.6). Without it Nitro's router falls through to the page renderer, which answers
 * an API client's DELETE on a GET-only route with a 404 page. The route table is the build's own
 * list of route files (nuxt.config.ts, '#brinkline/api-routes'), so it cannot drift.
 */
const routes = apiRoutes.map(r => ({ ...r, pattern: routePattern(r.route) }))

export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/')) return
  const path = event.path.split('?')[0]!
  const matching = routes.filter(r => r.pattern.test(path))
  if (matching.length === 0 || matching.some(r => r.method === undefined)) return
  const allowed = new Set(matching.map(r => r.method!.toUpperCase()))
  if (allowed.has('GET')) allowed.add('HEAD')
  if (allowed.has(event.method)) return
  const allow = [...allowed].sort().join(', ')
  setResponseHeader(event, 'Allow', allow)
  throw createError({ statusCode: 405, message: `method: ${event.method} is not allowed on ${path}; use ${allow}` })
})
