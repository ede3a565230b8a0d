import { describe, expect, it } from 'vitest'
import { sessionRefusal, type AccountState } from '../../../../server/services/accounts/sessionPolicy'

const MIN = 60_000
// NIST SP 800-63B-4 §2.2.3 (AAL2) [from memory]: reauthenticate after 30 minutes of inactivity.
const IDLE = 30 * MIN
const account: AccountState = { active: true, role: 'operator', sessionsValidAfter: null }
const session = { role: 'operator' as const, loggedInAt: 1_000 * MIN, lastSeenAt: 1_010 * MIN }

describe('sessions follow the account', () => {
  it('lets a session of an unchanged, active account through', () => {
    expect(sessionRefusal(session, account, 1_020 * MIN, IDLE)).toBeNull()
  })
  it('ends it when the account is disabled, gone, or its role changed', () => {
    expect(sessionRefusal(session, { ...account, active: false }, 1_020 * MIN, IDLE)).toMatch(/disabled/)
    expect(sessionRefusal(session, undefined, 1_020 * MIN, IDLE)).toMatch(/no longer exists/)
    expect(sessionRefusal(session, { ...account, role: 'engineer' }, 1_020 * MIN, IDLE)).toMatch(/role changed to engineer/)
  })
  it('ends sessions signed in before the cut-off, not those after it', () => {
    expect(sessionRefusal(session, { ...account, sessionsValidAfter: 1_005 * MIN }, 1_020 * MIN, IDLE)).toMatch(/ended/)
    expect(sessionRefusal(session, { ...account, sessionsValidAfter: 999 * MIN }, 1_020 * MIN, IDLE)).toBeNull()
  })
  it('ends a session idle for longer than the limit, measured from its last request', () => {
    expect(sessionRefusal(session, account, 1_010 * MIN + IDLE, IDLE)).toBeNull()
    expect(sessionRefusal(session, account, 1_010 * MIN + IDLE + 1, IDLE)).toMatch(/30 minutes without activity/)
  })
})
