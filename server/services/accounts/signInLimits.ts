import { RateLimiterDrizzle, RateLimiterRes } from 'rate-limiter-flexible'
import { rateLimits } from '../../db/schema'
import type { Db } from '../../utils/db'

/**
 * Sign-in attempt limits (issue 13 item 5), counted by rate-limiter-flexible in PostgreSQL
 * (`rate_limits`, one atomic upsert per counter) so they hold across instances and restarts.
 *
 * [common practice, OWASP Authentication Cheat Sheet; NIST SP 800-63B §5.2.2 "rate limiting"]
 * - **Account at one address**: a few failures, then a wait that ends with the window — the
 *   owner at their own console is never locked out for longer than that, and a guesser at
 *   another address cannot lock them out at all through this counter.
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
}

export type SignInReservation =
  | { allowed: true, settle: (succeeded: boolean) => Promise<void> }
  | { allowed: false, retryAfterS: number, limit: string }

export function createSignInLimiter(db: Db, settings: SignInLimitSettings) {
  const store = { storeClient: db, schema: rateLimits, clearExpiredByTimeout: true }
  const limiter = (keyPrefix: string, points: number, duration: number) => new RateLimiterDrizzle({ ...store, keyPrefix, points, duration })
  const counters = [
    { name: 'failed sign-ins for this account from this address',
      keyOf: (email: string, address: string) => `${email}|${address}`,
      limiter: limiter('sign-in:account@address', settings.perAccountAtAddress, settings.windowS) },
    { name: 'failed sign-ins from this address', keyOf: (_email: string, address: string) => address,
      limiter: limiter('sign-in:address', settings.perAddress, settings.windowS) },
    { name: 'failed sign-ins for this account', keyOf: (email: string) => email,
      limiter: limiter('sign-in:account', settings.perAccount, settings.perAccountWindowS) },
  ]

  return {
    async reserve(email: string, address: string): Promise<SignInReservation> {
      const taken: typeof counters = []
      for (const counter of counters) {
        try {
          await counter.limiter.consume(counter.keyOf(email, address))
          taken.push(counter)
        }
        catch (refusal) {
          if (!(refusal instanceof RateLimiterRes)) throw refusal
          // This attempt is not checked, so it must not count on the counters it already took.
          await Promise.all(taken.map(c => c.limiter.reward(c.keyOf(email, address))))
          return { allowed: false, retryAfterS: Math.max(1, Math.ceil(refusal.msBeforeNext / 1000)), limit: counter.name }
        }
      }
      return {
        allowed: true,
        async settle(succeeded) {
          if (!succeeded) return
          const [atAddress, ...others] = counters
          await atAddress!.limiter.delete(atAddress!.keyOf(email, address))
          await Promise.all(others.map(c => c.limiter.reward(c.keyOf(email, address))))
        },
      }
    },
  }
}
export type SignInLimiter = ReturnType<typeof createSignInLimiter>
