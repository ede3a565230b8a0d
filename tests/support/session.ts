import { url } from '@nuxt/test-utils/e2e'
import type { Role } from '../../shared/utils/roles'

export const DEMO_PASSWORD = process.env.BRINKLINE_DEMO_PASSWORD ?? 'brinkline-demo'
export const demoEmail = (role: Role) => `${role}@harrowgate.example`

/** Signs in through the public route and returns the session cookie for later requests. */
export async function signInAs(role: Role): Promise<string> {
  const res = await fetch(url('/api/public/sign-in'), {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: demoEmail(role), password: DEMO_PASSWORD }),
  })
  if (res.status !== 200) throw new Error(`sign-in as ${role} answered ${res.status}: ${await res.text()}`)
  const cookie = res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
  return cookie
}

/**
 * fetch against the test server with an optional session cookie; never throws on 4xx/5xx. A full
 * address (`http://…`) reaches another instance (tests/support/server.ts startServerInstance).
 */
export async function call(path: string, init: RequestInit & { cookie?: string, json?: unknown } = {}) {
  const headers = new Headers(init.headers)
  if (init.cookie) headers.set('cookie', init.cookie)
  if (init.json !== undefined) headers.set('content-type', 'application/json')
  const res = await fetch(/^https?:\/\//.test(path) ? path : url(path), { ...init, headers, body: init.json !== undefined ? JSON.stringify(init.json) : init.body })
  const text = await res.text()
  let body: unknown = text
  try { body = JSON.parse(text) } catch { /* not JSON */ }
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- each test reads the fields it checks; the assertions are the shape check
  return { status: res.status, headers: res.headers, body: body as any }
}
