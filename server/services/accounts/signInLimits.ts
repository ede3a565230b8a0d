import { RateLimiterDrizzle, RateLimiterRes } from 'rate-limiter-flexible'
import { rateLimits } from '../../db/schema'
import type { Db } from '../../utils/db'
import { waitAfterFailuresS } from './signInBackoff'

/**
 * Sign-in attempt limits (issue 13 item 5), counted by rate-limiter-flexible in PostgreSQL
 * (`rate_limits`, one atomic upsert per counter) so they hold across instances and restarts.
 *
 * [common practice, OWASP Authentication Cheat Sheet; NIST SP 800-63B §5.2.2 "rate limiting"]
 * - **Account at one address**: a few attempts in a row, then a wait of one window that doubles
 *   with each further failure, up to a ceiling (signInBackoff.ts); once a wait is over, one
 *   attempt at a time. The owner at their own console always outlasts it, and a guesser at
 *   another address cannot make them wait at all through this counter. A run ends at a success,
 *   or is forgotten `failureMemoryS` after it began.
 * - **Account from all addresses**: a larger hourly budget against guessing spread over many
 *   addresses (NIST: no more than 100 consecutive failures); when spent, every address waits for
 *   the rest of the hour — bounded, never a permanent lock.
 * - **Address**: sized for a control room where many consoles share one address behind NAT
 *   (about twenty operators mistyping a few times each in a shift change) rather than for one
 *   person, so one person's mistakes never lock the room out.
 *
 * An attempt is reserved on every counter *before* its password is checked: concurrent guesses
 * each take a point, so no more are checked than the limit allows (the old read-then-count let 40
 * concurrent guesses through a limit of 5). A successful sign-in gives its points back and clears
 * the account-at-address failures.
 */
export interface SignInLimitSettings {
  windowS: number
  perAccountAtAddress: number
  perAccount: number
  perAccountWindowS: number
  perAddress: number
  /** The longest wait after consecutive failures of an account at an address (s). */
  maxWaitS: number
  failureMemoryS: number
}

/** How long one attempt holds the account at an address for its check (s): far longer than one scrypt check. */
const ONE_ATTEMPT_AT_A_TIME_S = 60
/** Points of the counters that only count and never refuse. */
const UNCOUNTED = 1_000_000

export type SignInReservation =
  | { allowed: true, settle: (succeeded: boolean) => Promise<void> }
  | { allowed: false, retryAfterS: number, limit: string }

export function createSignInLimiter(db: Db, settings: SignInLimitSettings) {
  const store = { storeClient: db, schema: rateLimits, clearExpiredByTimeout: true }
  const limiter = (keyPrefix: string, points: number, duration: number) => new RateLimiterDrizzle({ ...store, keyPrefix, points, duration })
  const backoff = { free: settings.perAccountAtAddress, firstWaitS: settings.windowS, maxWaitS: settings.maxWaitS }
  const atAddress = (email: string, address: string) => `${email}|${address}`
  // Attempts of an account at an address since its last success (those being checked included),
  // and of them the failures; neither refuses by itself.
  const attemptsInRow = limiter('sign-in:attempts@address', UNCOUNTED, settings.failureMemoryS)
  const failuresInRow = limiter('sign-in:failures@address', UNCOUNTED, settings.failureMemoryS)
  // From the free-th attempt on, one at a time: held during a check, blocked for the wait after a failure.
  const waiting = { name: 'consecutive failed sign-ins for this account from this address', keyOf: atAddress,
    limiter: limiter('sign-in:wait@address', 1, ONE_ATTEMPT_AT_A_TIME_S) }
  const shared = [
    { name: 'failed sign-ins from this address', keyOf: (_email: string, address: string) => address,
      limiter: limiter('sign-in:address', settings.perAddress, settings.windowS) },
    { name: 'failed sign-ins for this account', keyOf: (email: string) => email,
      limiter: limiter('sign-in:account', settings.perAccount, settings.perAccountWindowS) },
  ]

  return {
    async reserve(email: string, address: string): Promise<SignInReservation> {
      const key = atAddress(email, address)
      // One atomic count: of concurrent attempts only the first free-1 pass without the one-at-a-time hold.
      const inRow = (await attemptsInRow.consume(key)).consumedPoints
      const waits = inRow >= backoff.free
      const taken: { limiter: RateLimiterDrizzle, key: string }[] = [{ limiter: attemptsInRow, key }]
      for (const counter of waits ? [waiting, ...shared] : shared) {
        try {
          await counter.limiter.consume(counter.keyOf(email, address))
          taken.push({ limiter: counter.limiter, key: counter.keyOf(email, address) })
        }
        catch (refusal) {
          if (!(refusal instanceof RateLimiterRes)) throw refusal
          // This attempt is not checked, so it must not count on the counters it already took.
          await Promise.all(taken.map(t => t.limiter.reward(t.key)))
          return { allowed: false, retryAfterS: Math.max(1, Math.ceil(refusal.msBeforeNext / 1000)), limit: counter.name }
        }
      }
      return {
        allowed: true,
        async settle(succeeded) {
          if (!succeeded) {
            // The wait follows the failures checked, not the attempt's number (concurrent ones come in any order).
            const failures = (await failuresInRow.penalty(key)).consumedPoints
            const waitS = waitAfterFailuresS(failures, backoff)
            if (waitS > 0) await waiting.limiter.block(key, waitS)
            return
          }
          await Promise.all([attemptsInRow, failuresInRow, waiting.limiter].map(l => l.delete(key)))
          await Promise.all(shared.map(c => c.limiter.reward(c.keyOf(email, address))))
        },
      }
    },
  }
}
export type SignInLimiter = ReturnType<typeof createSignInLimiter>
