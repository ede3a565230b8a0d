import { signInSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, signInSchema)
  const tools = { limiter: useSignInLimiter(), hashPassword, verifyPassword }
  const outcome = await signIn(useDb(), { email, password, address: clientAddress(event) }, tools)
  if (!outcome.signedIn) {
    if (outcome.statusCode === 429) setResponseHeader(event, 'Retry-After', outcome.retryAfterS)
    throw createError({ statusCode: outcome.statusCode, message: outcome.message })
  }
  const now = Date.now()
  await startFreshSession(event, { user: outcome.user, loggedInAt: now, lastSeenAt: now })
  return { user: outcome.user }
})
