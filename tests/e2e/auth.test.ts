import { describe, expect, it } from 'vitest'
import { setupBuiltServer } from '../support/server'
import { call, DEMO_PASSWORD, demoEmail, signInAs } from '../support/session'

await setupBuiltServer()

describe('sign-in and role checks on the server', () => {
  it('answers 401 to an anonymous call of a protected route', async () => {
    // RFC 9110 §15.5.2: 401 when the request lacks valid authentication [common practice]
    expect((await call('/api/units')).status).toBe(401)
    expect((await call('/api/admin/users')).status).toBe(401)
  })

  it('answers 403 when an operator calls an admin route', async () => {
    // RFC 9110 §15.5.4: 403 when authenticated but not permitted [common practice]
    const cookie = await signInAs('operator')
    const res = await call('/api/admin/users', { cookie })
    expect(res.status).toBe(403)
    expect(res.body.message).toMatch(/admin/)
  })

  it('lets the admin list users and read the audit log, which records sign-ins', async () => {
    const cookie = await signInAs('admin')
    const users = await call('/api/admin/users', { cookie })
    expect(users.status).toBe(200)
    expect(users.body.map((u: { role: string }) => u.role).sort()).toEqual(['admin', 'engineer', 'operator', 'supervisor'])
    expect(JSON.stringify(users.body)).not.toMatch(/password/i)
    const audit = await call('/api/admin/audit?limit=50', { cookie })
    expect(audit.body.some((e: { action: string, target: string }) => e.action === 'sign-in' && e.target === demoEmail('admin'))).toBe(true)
  })

  it('names each bad field in a 400', async () => {
    const res = await call('/api/public/sign-in', { method: 'POST', json: { email: 'not-an-address' } })
    expect(res.status).toBe(400)
    expect(res.body.message).toContain('email: must be an e-mail address')
    expect(res.body.message).toContain('password: is required')
  })

  it('rejects a wrong password without saying whether the account exists', async () => {
    const wrong = await call('/api/public/sign-in', { method: 'POST', json: { email: demoEmail('engineer'), password: 'wrong' } })
    const unknown = await call('/api/public/sign-in', { method: 'POST', json: { email: 'nobody@harrowgate.example', password: 'wrong' } })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.message).toBe(unknown.body.message)
  })

  it('locks an account after repeated failures, even for the right password', async () => {
    const email = demoEmail('supervisor')
    for (let i = 0; i < 5; i++)
      await call('/api/public/sign-in', { method: 'POST', json: { email, password: `guess-${i}` } })
    const res = await call('/api/public/sign-in', { method: 'POST', json: { email, password: DEMO_PASSWORD } })
    expect(res.status).toBe(429)
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0)
  })

  it('ends the session on sign-out', async () => {
    const cookie = await signInAs('engineer')
    expect((await call('/api/units', { cookie })).status).toBe(200)
    const out = await call('/api/session/sign-out', { method: 'POST', cookie })
    expect(out.status).toBe(200)
    const cleared = out.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
    expect((await call('/api/units', { cookie: cleared })).status).toBe(401)
    // A copy of the old cookie (another tab, a stolen header) is refused too.
    const replayed = await call('/api/units', { cookie })
    expect(replayed.status).toBe(401)
    expect(replayed.body.message).toMatch(/signed out/)
  })

  it('gives a new session id at every sign-in, even when the browser still sends an old cookie', async () => {
    // OWASP Session Management Cheat Sheet: renew the session ID after any privilege level change,
    // sign-in included (session fixation) [common practice]. A signed-out id carried into the next
    // sign-in would make the fresh session read "signed out" at once.
    const old = await signInAs('operator')
    expect((await call('/api/session/sign-out', { method: 'POST', cookie: old })).status).toBe(200)
    const again = await call('/api/public/sign-in', { method: 'POST', cookie: old, json: { email: demoEmail('operator'), password: DEMO_PASSWORD } })
    expect(again.status).toBe(200)
    const fresh = again.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
    expect(fresh).not.toBe(old)
    expect((await call('/api/units', { cookie: fresh })).status).toBe(200)
  })
})
