import { afterAll, describe, expect, it } from 'vitest'
import { startServer, stopServer, url } from '@nuxt/test-utils/e2e'
import { IngestClient, type IngestSample } from '../../simulators/lib/ingestClient'
import { setupBuiltServer } from '../support/server'
import { testSql } from '../support/db'
import { createTestGateway } from '../support/gateway'

// A fixed port, so the gateway finds the server again at the same address after the restart.
await setupBuiltServer({}, { port: 39000 + Math.floor(Math.random() * 1000) })
const sql = testSql()
afterAll(() => sql.end())

describe('a gateway during a server outage', () => {
  it('buffers while the server is down and delivers every sample once it is back', async () => {
    const { key } = await createTestGateway('buffering-gateway')
    const t0 = Date.UTC(2026, 3, 1)
    const samples: IngestSample[] = Array.from({ length: 1200 }, (_, i) => ({
      tag: i % 2 ? 'TI-401' : 'LI-402', time: new Date(t0 + Math.floor(i / 2) * 5000).toISOString(), value: 40 + Math.sin(i), quality: 'good',
    }))
    await stopServer()
    const client = new IngestClient({ baseUrl: url('/').replace(/\/$/, ''), key, maxBatch: 500, backoff: { initialMs: 100, maxMs: 1000 }, log: () => {} })
    client.enqueue(samples)
    // However slow the machine, the client must have tried (and failed) before anything counts.
    await expect.poll(() => client.stats.failedAttempts, { timeout: 30_000, interval: 100 }).toBeGreaterThan(0)
    expect(client.stats.accepted).toBe(0)

    await startServer()
    await client.idle()
    expect(client.stats).toMatchObject({ accepted: 1200, dropped: 0, rejected: 0, buffered: 0 })
    const [row] = await sql`select count(*)::int as n from samples s join tags t on t.id = s.tag_id
      where t.code in ('TI-401', 'LI-402') and s.time >= ${new Date(t0)} and s.time < ${new Date(t0 + 600 * 5000)}`
    expect(row!.n).toBe(1200)
    await client.close()
  })
})
