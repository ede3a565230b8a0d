/**
 * A route as the build names it, as a regular expression over request paths:
 * '/api/tags/:id/series' → /^\/api\/tags\/[^/]+\/series\/?$/ ; '/api/x/**' matches the rest of the path.
 */
export function routePattern(route: string): RegExp {
  const body = route.split('/').map((segment) => {
    if (segment.startsWith('**')) return '.*'
    if (segment.startsWith(':')) return '[^/]+'
    return segment.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')
  }).join('/')
  return new RegExp(`^${body}/?$`)
}
