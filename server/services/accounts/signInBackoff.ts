/**
 * How long an account waits at one address after consecutive failed sign-ins (issue 13 item 6):
 * the free attempts, then a wait that doubles with every further failure, up to a ceiling.
 * A fixed window let a guesser try `free` passwords every window for ever; doubling makes the
 * n-th extra guess cost 2^n windows [common practice: OWASP Authentication Cheat Sheet,
 * "exponential back-off"; NIST SP 800-63B §5.2.2 lists increasing waits among rate limits].
 * The ceiling keeps it a wait, never a lockout the owner cannot outlast.
 */
export interface SignInBackoffSettings {
  /** Failures in a row before the first wait. */
  free: number
  /** The first wait (s), after the `free`-th failure. */
  firstWaitS: number
  /** The longest wait (s). */
  maxWaitS: number
}

/** Seconds to wait after `failures` consecutive failures; 0 while attempts are still free. */
export function waitAfterFailuresS(failures: number, settings: SignInBackoffSettings): number {
  if (failures < settings.free) return 0
  const doublings = failures - settings.free
  // 2^doublings overflows to Infinity long after the ceiling is reached; min() keeps it finite.
  return Math.min(settings.maxWaitS, settings.firstWaitS * 2 ** doublings)
}
