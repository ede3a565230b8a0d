import { describe, expect, it } from 'vitest'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// A 2-second session (the real default is one 12-hour shift), so expiry can be watched.
await setupBuiltServer({ NUXT_SESSION_MAX_AGE: '2' })

describe('session expiry', () => {
  it('turns a session into a 401 once its age passes the limit', async () => {
    const cookie = await signInAs('operator')
    expect((await call('/api/units', { cookie })).status).toBe(200)
    await new Promise(r => setTimeout(r, 3_000))
    expect((await call('/api/units', { cookie })).status).toBe(401)
  })
})
