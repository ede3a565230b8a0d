import { afterAll, describe, expect, it } from 'vitest'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { createTestGateway, ingest } from '../support/gateway'
import { postgres } from '../support/postgresControl'

await setupBuiltServer()
afterAll(() => postgres('start'))

describe('a database outage', () => {
  it('answers 503 with Retry-After while PostgreSQL is down, and recovers when it is back', async () => {
    const { key } = await createTestGateway('outage-gateway')
    const cookie = await signInAs('operator')
    const batch = { samples: [{ tag: 'TI-401', time: '2026-02-01T00:00:00Z', value: 21.5 }] }

    postgres('stop')
    const down = await ingest(key, batch)
    expect(down.status).toBe(503)
    expect(Number(down.headers.get('retry-after'))).toBeGreaterThan(0)
    expect((await call('/api/units', { cookie })).status).toBe(503)

    postgres('start')
    // The pool reconnects on its own; the gateway's retry then lands.
    await expect.poll(async () => (await ingest(key, batch)).status, { timeout: 20_000, interval: 500 }).toBe(200)
    expect((await call('/api/units', { cookie })).status).toBe(200)
  })
})
