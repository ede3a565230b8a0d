import { describe, expect, it } from 'vitest'
import { waitAfterFailuresS } from '../../../../server/services/accounts/signInBackoff'

// Exponential back-off as the OWASP Authentication Cheat Sheet describes it [common practice]:
// each failure past the free ones doubles the wait; here 5 free, 15 minutes first, a day at most.
const settings = { free: 5, firstWaitS: 900, maxWaitS: 86_400 }

describe('sign-in wait after consecutive failures', () => {
  it('is free for the first failures, then the first wait at the free-th failure', () => {
    expect([0, 1, 4].map(n => waitAfterFailuresS(n, settings))).toEqual([0, 0, 0])
    expect(waitAfterFailuresS(5, settings)).toBe(900)
  })

  it('doubles with each further failure: 15, 30, 60, 120 minutes', () => {
    expect([5, 6, 7, 8].map(n => waitAfterFailuresS(n, settings) / 60)).toEqual([15, 30, 60, 120])
  })

  it('stops at the ceiling and stays finite however long a guesser goes on', () => {
    // 900 × 2^7 = 115,200 s is the first past a day (86,400 s).
    expect(waitAfterFailuresS(11, settings)).toBe(57_600)
    expect(waitAfterFailuresS(12, settings)).toBe(86_400)
    expect(waitAfterFailuresS(10_000, settings)).toBe(86_400)
  })
})
