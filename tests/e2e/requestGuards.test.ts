import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { testSql } from '../support/db'

await setupBuiltServer()
const sql = testSql()
const SIM_KEY = process.env.BRINKLINE_SIM_KEY!
const notes = async () => Number((await sql`select count(*)::int as n from shift_log_notes`)[0]!.n)
const own = () => new URL(url('/')).origin
const foreign = () => { const u = new URL(url('/')); u.port = String(Number(u.port) + 1); return u.origin }

describe('state-changing API calls must come from this origin and carry JSON (issue 13 item 4)', () => {
  it('refuses a foreign Origin, a foreign Referer and Origin "null", storing nothing', async () => {
    const cookie = await signInAs('supervisor')
    const before = await notes()
    for (const headers of [{ origin: foreign() }, { referer: `${foreign()}/page` }, { origin: 'null' }]) {
      const res = await call('/api/shift-log', { method: 'POST', cookie, headers, json: { body: 'cross-site note' } })
      expect(res.status, JSON.stringify(headers)).toBe(403)
      expect(res.body.message).toMatch(/(Origin|Referer): .* is not this server's origin/)
    }
    expect(await notes()).toBe(before)
  })

  it('accepts its own Origin or Referer, and a client that sends neither (a script, not a page)', async () => {
    const cookie = await signInAs('supervisor')
    for (const headers of [{ origin: own() }, { referer: `${own()}/shift-log` }, {}])
      expect((await call('/api/shift-log', { method: 'POST', cookie, headers, json: { body: 'own note' } })).status).toBe(201)
  })

  it('refuses bodies that are not JSON with 415 naming content-type, and a typeless body', async () => {
    const cookie = await signInAs('supervisor')
    const before = await notes()
    for (const type of ['application/x-www-form-urlencoded', 'text/plain', 'multipart/form-data; boundary=x']) {
      const res = await call('/api/shift-log', { method: 'POST', cookie, headers: { 'content-type': type }, body: '{"body":"x"}' })
      expect(res.status, type).toBe(415)
      expect(res.body.message).toContain(`content-type: ${type.split(';')[0]} is not accepted here`)
    }
    const typeless = await call('/api/shift-log', { method: 'POST', cookie, body: new Blob(['{"body":"x"}']) })
    expect(typeless.status).toBe(415)
    expect(typeless.body.message).toContain('content-type: is required with a body')
    expect(await notes()).toBe(before)
  })

  it('lets the upload routes take text/csv, still checking Origin', async () => {
    const cookie = await signInAs('engineer')
    const csv = 'Timestamp,Tag,Value\n2025-08-04T14:00:00Z,TI-401,38.2\n'
    const preview = (origin: string) =>
      call('/api/uploads/preview?siteId=1&complete=1', {
        method: 'POST', cookie, headers: { 'content-type': 'text/csv', origin }, body: csv,
      })
    expect((await preview(own())).status).toBe(200)
    expect((await preview(foreign())).status).toBe(403)
    const plain = await call('/api/uploads/import?siteId=1&format=long', {
      method: 'POST', cookie, headers: { 'content-type': 'text/plain' }, body: csv,
    })
    expect(plain.status).toBe(415)
    expect(plain.body.message).toContain('send text/csv')
  })

  it('exempts the gateway ingest route from the Origin check (key, no cookie) but not from JSON', async () => {
    const samples = [{ tag: 'TI-401', time: new Date(Date.now() - 60_000).toISOString(), value: 40 }]
    const auth = { authorization: `Bearer ${SIM_KEY}` }
    const fromAnywhere = await call('/api/ingest', { method: 'POST', headers: { ...auth, origin: foreign() }, json: { samples } })
    expect(fromAnywhere.status).toBe(200)
    const form = await call('/api/ingest', {
      method: 'POST', headers: { ...auth, 'content-type': 'text/plain' }, body: JSON.stringify({ samples }),
    })
    expect(form.status).toBe(415)
  })
})

describe('response headers', () => {
  it('pages refuse framing and carry a nonce-based content security policy; no X-Powered-By', async () => {
    const res = await fetch(url('/sign-in'))
    const csp = res.headers.get('content-security-policy') ?? ''
    // CSP Level 3 frame-ancestors; RFC 7034 X-Frame-Options [common practice: OWASP Secure Headers]
    expect(csp).toContain("frame-ancestors 'none'")
    expect(res.headers.get('x-frame-options')).toBe('DENY')
    const nonce = /'nonce-([^']+)'/.exec(csp)?.[1]
    expect(nonce).toMatch(/^[A-Za-z0-9+/=_-]{16,}$/)
    expect(csp).not.toContain("'unsafe-inline' 'strict-dynamic'")
    expect(csp).toMatch(/object-src 'none'/)
    expect(await res.text()).toContain(`nonce="${nonce}"`)
    expect(res.headers.get('x-content-type-options')).toBe('nosniff')
    expect(res.headers.get('x-powered-by')).toBeNull()
  })

  it('API JSON is Cache-Control: no-store, framing refused, no X-Powered-By', async () => {
    const cookie = await signInAs('engineer')
    for (const path of ['/api/units', '/api/public/health']) {
      const res = await call(path, { cookie })
      expect(res.status).toBe(200)
      // RFC 9111 §5.2.2.5 no-store
      expect(res.headers.get('cache-control')).toBe('no-store')
      expect(res.headers.get('x-frame-options')).toBe('DENY')
      expect(res.headers.get('x-powered-by')).toBeNull()
    }
  })

  it('answers 405 with Allow for a method a route does not have (RFC 9110 §15.5.6)', async () => {
    const cookie = await signInAs('engineer')
    const del = await call('/api/units', { method: 'DELETE', cookie })
    expect(del.status).toBe(405)
    expect(del.headers.get('allow')).toBe('GET, HEAD, POST')
    const put = await call('/api/tags/1', { method: 'PUT', cookie, json: {} })
    expect(put.status).toBe(405)
    expect(put.headers.get('allow')).toBe('PATCH')
    const getSignIn = await call('/api/public/sign-in')
    expect(getSignIn.status).toBe(405)
    expect(getSignIn.headers.get('allow')).toBe('POST')
    expect((await call('/api/no-such-route', { cookie })).status).toBe(404)
  })
})
