import { call, signInAs } from './session'

/** Creates a gateway through the admin API and returns its one-time key. */
export async function createTestGateway(name: string): Promise<{ id: number, key: string, adminCookie: string }> {
  const adminCookie = await signInAs('admin')
  const sites = await call('/api/sites', { cookie: adminCookie })
  const res = await call('/api/admin/gateways', { method: 'POST', cookie: adminCookie, json: { siteId: sites.body[0].id, name } })
  if (res.status !== 201) throw new Error(`gateway create answered ${res.status}: ${JSON.stringify(res.body)}`)
  return { id: res.body.id, key: res.body.key, adminCookie }
}

export function ingest(key: string, body: unknown) {
  return call('/api/ingest', { method: 'POST', headers: { authorization: `Bearer ${key}` }, json: body })
}
