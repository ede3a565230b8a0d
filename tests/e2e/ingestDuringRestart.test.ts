import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { createTestGateway, ingest } from '../support/gateway'
import { createTestTag, waitForDemoSite } from '../support/pipeline'
import { postgres } from '../support/postgresControl'
import { setupBuiltServer } from '../support/server'

// PostgreSQL restarted while gateways keep posting: a batch the server acknowledged (200) was
// committed first, so no acknowledged sample may be missing afterwards; a batch caught by the
// outage is refused (503 with Retry-After), never half-stored, and the gateway's resend lands.
// A "fast" shutdown rolls back open transactions and keeps committed ones (PostgreSQL manual,
// pg_ctl "-m fast" [from memory]).

// The per-key request budget would only slow the loop below; it has tests of its own.
await setupBuiltServer({ NUXT_INGEST_REQUESTS_PER_MINUTE: '1000000' })
const sql = testSql()
afterAll(async () => { postgres('start'); await sql.end() })

const TAGS = 50
const codes = Array.from({ length: TAGS }, (_, i) => `TR-${300 + i}`)
const tagIds: number[] = []
let key = ''
const t0 = Date.now() - 3_600_000

beforeAll(async () => {
  await waitForDemoSite(sql)
  for (const code of codes) tagIds.push(await createTestTag(sql, code, 'R-100', 1))
  key = (await createTestGateway('restart-gateway')).key
})

/** Batch k: one sample per tag at second k. */
const batch = (k: number) => ({
  samples: codes.map((tag, j) => ({ tag, time: new Date(t0 + k * 1000).toISOString(), value: 40 + j + k / 1000 })),
})

describe('a database restart during ingest', () => {
  it('loses no acknowledged sample; batches refused during it are 503 and land when resent', async () => {
    const acknowledged = new Set<number>()
    const statuses = new Map<number, number>()
    const pending: number[] = []
    let next = 0
    let phase: 'before' | 'down' | 'after' = 'before'
    const ackedIn = { before: 0, down: 0, after: 0 }
    const refusedDuringOutage: number[] = []

    // Two gateways' worth of concurrent posts, so batches are in flight as the database stops.
    const worker = async () => {
      while (phase !== 'after' || ackedIn.after < 20 || pending.length > 0) {
        const k = pending.shift() ?? next++
        const res = await ingest(key, batch(k)).catch(() => ({ status: 0, body: null, headers: new Headers() }))
        statuses.set(k, res.status)
        if (res.status === 200) {
          expect(res.body.accepted + res.body.duplicates).toBe(TAGS)
          acknowledged.add(k)
          ackedIn[phase]++
        }
        else {
          if (phase === 'down') refusedDuringOutage.push(res.status)
          pending.push(k)
          await new Promise(resolve => setTimeout(resolve, 50))
        }
      }
    }
    const control = async () => {
      await expect.poll(() => ackedIn.before, { timeout: 60_000, interval: 20 }).toBeGreaterThanOrEqual(20)
      phase = 'down'
      postgres('stop')
      await expect.poll(() => refusedDuringOutage.length, { timeout: 60_000, interval: 20 }).toBeGreaterThanOrEqual(5)
      postgres('start')
      phase = 'after'
    }
    await Promise.all([worker(), worker(), control()])

    expect(refusedDuringOutage.length).toBeGreaterThanOrEqual(5)
    expect(refusedDuringOutage.every(s => s === 503), JSON.stringify(refusedDuringOutage)).toBe(true)
    // Every batch tried was acknowledged in the end (the refused ones on a resend).
    expect([...statuses.keys()].every(k => acknowledged.has(k))).toBe(true)
    const stored = await sql`select s.tag_id, extract(epoch from s.time)::float8 * 1000 as ms from samples s where s.tag_id in ${sql(tagIds)}`
    const have = new Set(stored.map(r => `${r.tag_id}@${Math.round(r.ms)}`))
    const missing = [...acknowledged].flatMap(k => tagIds.filter(id => !have.has(`${id}@${t0 + k * 1000}`)).map(id => `${id}@${k}`))
    expect(missing).toEqual([])
    // Nothing beyond what was sent, and each sample once (the (tag, time) key holds it once).
    expect(stored).toHaveLength(acknowledged.size * TAGS)
  })
})
