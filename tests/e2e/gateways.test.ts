import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { createTestGateway, ingest } from '../support/gateway'
import { waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call } from '../support/session'

await setupBuiltServer()
const sql = testSql()
afterAll(async () => { await sql.end() })
beforeAll(async () => { await waitForDemoSite(sql) })

let t = Date.now() - 120_000
const sample = (tag = 'TI-401') => ({ samples: [{ tag, time: new Date(t += 1000).toISOString(), value: 44 }] })

describe('gateway keys: rotate with a grace period, revoke', () => {
  it('keeps the old key working through its grace period, then refuses it', async () => {
    const { id, key: first, adminCookie } = await createTestGateway('Rotation box')
    const rotated = await call(`/api/admin/gateways/${id}/rotate`, { method: 'POST', cookie: adminCookie, json: { graceMinutes: 60 } })
    expect(rotated.status).toBe(200)
    const second = rotated.body.key as string
    expect(second).toMatch(/^bk_/)
    expect(second).not.toBe(first)
    expect(Date.parse(rotated.body.previousKeyExpiresAt) - Date.now()).toBeGreaterThan(59 * 60_000)
    expect((await ingest(second, sample())).status).toBe(200)
    expect((await ingest(first, sample())).status).toBe(200)
    // The grace period ends (moved into the past in the database, not waited for).
    await sql`update gateways set previous_key_expires_at = now() - interval '1 second' where id = ${id}`
    expect((await ingest(first, sample())).status).toBe(401)
    expect((await ingest(second, sample())).status).toBe(200)

    const [audit] = await sql`select detail from audit_log where action = 'gateway.rotate-key' and (detail->>'id')::int = ${id}`
    expect(audit!.detail.before.keyPrefix).toBe(first.slice(0, 8))
    expect(audit!.detail.after.keyPrefix).toBe(second.slice(0, 8))
    expect(audit!.detail.after.previousKeyPrefix).toBe(first.slice(0, 8))
    expect(JSON.stringify(audit!.detail)).not.toContain(second)
  })

  it('stops the old key at once with no grace, and a revoke stops every key', async () => {
    const { id, key: first, adminCookie } = await createTestGateway('No-grace box')
    const r1 = await call(`/api/admin/gateways/${id}/rotate`, { method: 'POST', cookie: adminCookie, json: { graceMinutes: 0 } })
    expect((await ingest(first, sample())).status).toBe(401)
    const r2 = await call(`/api/admin/gateways/${id}/rotate`, { method: 'POST', cookie: adminCookie, json: {} })
    expect((await ingest(r1.body.key, sample())).status).toBe(200) // default grace: 24 h
    expect((await call(`/api/admin/gateways/${id}/revoke`, { method: 'POST', cookie: adminCookie })).status).toBe(200)
    expect((await ingest(r1.body.key, sample())).status).toBe(401)
    expect((await ingest(r2.body.key, sample())).status).toBe(401)
    expect((await call(`/api/admin/gateways/${id}/rotate`, { method: 'POST', cookie: adminCookie, json: {} })).status).toBe(404)
  })

  it('names the field of a bad grace period', async () => {
    const { id, adminCookie } = await createTestGateway('Bad-grace box')
    for (const graceMinutes of [-1, 1.5, 7 * 24 * 60 + 1, 'soon']) {
      const res = await call(`/api/admin/gateways/${id}/rotate`, { method: 'POST', cookie: adminCookie, json: { graceMinutes } })
      expect(res.status).toBe(400)
      expect(res.body.message).toContain('graceMinutes:')
    }
    const [row] = await sql`select key_rotated_at from gateways where id = ${id}`
    expect(row!.key_rotated_at).toBeNull()
  })
})

describe('gateway traffic', () => {
  it('counts accepted and rejected samples and refused batches per hour, where ingest counts them', async () => {
    const { id, key, adminCookie } = await createTestGateway('Counting box')
    await ingest(key, { samples: [sample().samples[0], sample().samples[0], sample('NO-SUCH-TAG').samples[0]] })
    expect((await ingest(key, { samples: 'not a list' })).status).toBe(400)
    const list = await call('/api/admin/gateways', { cookie: adminCookie })
    const g = list.body.find((x: { id: number }) => x.id === id)
    expect(g.hourly).toHaveLength(24)
    const total = (k: string) => g.hourly.reduce((s: number, h: Record<string, number>) => s + h[k]!, 0)
    expect(total('accepted')).toBe(2)
    expect(total('rejected')).toBe(1)
    expect(total('failedBatches')).toBe(1)
    expect(g.acceptedCount).toBe(2)
    expect(g.lastContactAt).not.toBeNull()
  })
})
