/**
 * Every /api route reads its body within a byte limit (issue 13 item 6): the default for JSON
 * forms, or the larger one its contract documents (server/utils/bodyLimits.ts). An anonymous
 * client could otherwise make the server hold and parse any size it likes before a route's
 * checks run. The reading itself is server/utils/limitedBody.ts.
 */
export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/')) return
  limitRequestBody(event, bodyLimitFor(event.method, event.path.split('?')[0]!))
})
