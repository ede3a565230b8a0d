import type { H3Event } from 'h3'
import { RateLimiterMemory, RateLimiterRes } from 'rate-limiter-flexible'
import { createSignInLimiter, type SignInLimiter } from '../services/accounts/signInLimits'

let signInLimiter: SignInLimiter | undefined
/** The one sign-in limiter of this process (its counters live in PostgreSQL), sized by runtimeConfig.signIn. */
export function useSignInLimiter(): SignInLimiter {
  signInLimiter ??= createSignInLimiter(useDb(), useRuntimeConfig().signIn)
  return signInLimiter
}

let ingestLimiter: RateLimiterMemory | undefined
/**
 * Requests per gateway key and minute. Counted in this instance's memory: a gateway talks to one
 * instance at a time, and a database write per batch only to count it would cost more than it guards.
 */
export function useIngestLimiter(): RateLimiterMemory {
  ingestLimiter ??= new RateLimiterMemory({ keyPrefix: 'ingest', points: useRuntimeConfig().ingest.requestsPerMinute, duration: 60 })
  return ingestLimiter
}

/** 429 with Retry-After once a gateway key has used this minute's requests; the gateway client backs off and retries. */
export async function requireIngestBudget(event: H3Event, gatewayId: number): Promise<void> {
  const limiter = useIngestLimiter()
  try {
    await limiter.consume(String(gatewayId))
  }
  catch (refusal) {
    if (!(refusal instanceof RateLimiterRes)) throw refusal
    const retryAfterS = Math.max(1, Math.ceil(refusal.msBeforeNext / 1000))
    setResponseHeader(event, 'Retry-After', retryAfterS)
    const message = `Too many requests for this ingest key: at most ${limiter.points} a minute; retry in ${retryAfterS} s`
    throw createError({ statusCode: 429, message })
  }
}
