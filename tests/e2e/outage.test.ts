import { afterAll, describe, expect, it, onTestFailed } from 'vitest'
import { setupBuiltServer, startServerInstance } from '../support/server'
import { eventually } from '../support/eventually'
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

  it('logs one line per scheduled task while the database is down, no stack per run, and one when it answers again', async () => {
    // A second instance of the build, so its own output can be read; its schedules run as deployed.
    // A relay address (nothing listens there) makes the sender read its outbox every 5 s.
    // NODE_ENV=production and no TEST: vitest sets both in the env the instance inherits, and
    // nitro runs no schedule in test mode.
    const instance = await startServerInstance({ NUXT_SMTP_URL: 'smtp://127.0.0.1:9', NODE_ENV: 'production', TEST: '' })
    const lines = (pattern: RegExp) => instance.logs().split('\n').filter(line => pattern.test(line))
    onTestFailed(() => console.log(instance.logs().slice(-4000)))
    postgres('stop')
    // notifications:send runs every 5 s and indicators:refresh every 10 s: both meet the outage.
    await eventually('both tasks to report the outage', async () =>
      (lines(/\[task\] notifications:send: database unavailable/).length && lines(/\[task\] indicators:refresh: database unavailable/).length ? true : undefined))
    postgres('start')
    await eventually('the database to answer the tasks again', async () =>
      (lines(/\[task\] notifications:send: the database answers again/).length ? true : undefined))
    expect(lines(/\[task\] notifications:send: database unavailable/)).toHaveLength(1)
    expect(lines(/\[task\] indicators:refresh: database unavailable/)).toHaveLength(1)
    expect(lines(/Error while running scheduled task/)).toEqual([])
    await instance.stop()
  })
})
