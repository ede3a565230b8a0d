import { describe, expect, it } from 'vitest'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// A 3-second idle limit (the real default is 30 minutes, NIST SP 800-63B AAL2 [from memory]).
await setupBuiltServer({ NUXT_SESSION_IDLE_MINUTES: '0.05' })

describe('idle timeout', () => {
  it('ends a session that made no request for longer than the idle limit, with a reason', async () => {
    const cookie = await signInAs('operator')
    await new Promise(r => setTimeout(r, 4_000))
    const res = await call('/api/units', { cookie })
    expect(res.status).toBe(401)
    expect(res.body.message).toMatch(/without activity/)
  })
})
