import { afterAll, describe, expect, it } from 'vitest'
import { MAX_BATCH_SAMPLES } from '../../shared/schemas/ingest'
import { setupBuiltServer } from '../support/server'
import { call } from '../support/session'
import { testSql } from '../support/db'
import { createTestGateway, ingest } from '../support/gateway'

await setupBuiltServer()
const sql = testSql()
afterAll(() => sql.end())

const T0 = Date.UTC(2026, 0, 5, 8, 0, 0)
const countFor = async (code: string, fromMs: number, toMs: number) => {
  const [row] = await sql`select count(*)::int as n from samples s join tags t on t.id = s.tag_id
    where t.code = ${code} and s.time >= ${new Date(fromMs)} and s.time <= ${new Date(toMs)}`
  return row!.n as number
}

describe('POST /api/ingest', () => {
  it('refuses a missing, unknown or revoked key with 401', async () => {
    expect((await call('/api/ingest', { method: 'POST', json: { samples: [] } })).status).toBe(401)
    expect((await ingest('bk_not-a-real-key', { samples: [] })).status).toBe(401)
    const gw = await createTestGateway('revoked-gateway')
    const revoke = await call(`/api/admin/gateways/${gw.id}/revoke`, { method: 'POST', cookie: gw.adminCookie })
    expect(revoke.status).toBe(200)
    const res = await ingest(gw.key, { samples: [{ tag: 'TI-101', time: T0, value: 1 }] })
    expect(res.status).toBe(401)
    expect(res.body.message).toMatch(/revoked/)
  })

  it('stores out-of-order samples once, however often a batch is retried', async () => {
    const { key } = await createTestGateway('retrying-gateway')
    const batch = { samples: [3, 1, 2, 0].map(i => ({ tag: 'TI-401', time: new Date(T0 + i * 5000).toISOString(), value: 20 + i })) }
    const first = await ingest(key, batch)
    expect(first.status).toBe(200)
    expect(first.body).toMatchObject({ accepted: 4, duplicates: 0, rejected: [] })
    const retry = await ingest(key, batch)
    expect(retry.body).toMatchObject({ accepted: 0, duplicates: 4 })
    expect(await countFor('TI-401', T0, T0 + 15_000)).toBe(4)
  })

  it('rejects bad samples one by one, naming index, field and reason, and keeps the good ones', async () => {
    const { key } = await createTestGateway('sloppy-gateway')
    const t = T0 + 3_600_000
    const res = await ingest(key, { samples: [
      { tag: 'LI-402', time: t, value: 50.1 },
      { tag: 'XX-999', time: t, value: 1 },
      { tag: 'LI-402', time: '2026-01-05 09:00:05', value: 1 },
      { tag: 'LI-402', time: t + 10_000, value: 'high' },
      { tag: 'LI-402', time: t + 15_000, value: 2, quality: 'excellent' },
      { tag: 'LI-402', time: 1_767_600_000, value: 3 },
      { tag: 'LI-402', time: '2026-01-05T09:00:20+01:00', value: 50.3, quality: 'uncertain' },
    ] })
    expect(res.status).toBe(200)
    expect(res.body.accepted).toBe(2)
    expect(res.body.rejected.map((r: { index: number, field: string }) => [r.index, r.field]))
      .toEqual([[1, 'tag'], [2, 'time'], [3, 'value'], [4, 'quality'], [5, 'time']])
    expect(res.body.rejected[0].reason).toContain('XX-999')
    expect(res.body.rejected[2].reason).toBe('must be a finite number')
    expect(res.body.rejected[4].reason).toMatch(/seconds/)
    const [row] = await sql`select quality from samples s join tags t on t.id = s.tag_id
      where t.code = 'LI-402' and s.time = ${new Date('2026-01-05T08:00:20Z')}`
    expect(row!.quality).toBe(1)
  })

  it('answers a malformed envelope with 400 and an oversized batch with 413, storing nothing', async () => {
    const { key } = await createTestGateway('oversized-gateway')
    const missing = await ingest(key, { readings: [] })
    expect(missing.status).toBe(400)
    expect(missing.body.message).toContain('samples: is required')
    const t = T0 + 7_200_000
    const big = { samples: Array.from({ length: MAX_BATCH_SAMPLES + 1 }, (_, i) => ({ tag: 'TI-401', time: t + i * 1000, value: 1 })) }
    const tooMany = await ingest(key, big)
    expect(tooMany.status).toBe(413)
    expect(tooMany.body.message).toContain(String(MAX_BATCH_SAMPLES))
    expect(await countFor('TI-401', t, t + (MAX_BATCH_SAMPLES + 1) * 1000)).toBe(0)
  })

  it('keeps per-gateway contact time and counts for the admin', async () => {
    const gw = await createTestGateway('counted-gateway')
    const t = T0 + 10_800_000
    await ingest(gw.key, { samples: [{ tag: 'TI-401', time: t, value: 1 }, { tag: 'nope', time: t, value: 1 }] })
    await ingest(gw.key, { samples: [{ tag: 'TI-401', time: t, value: 1 }] })
    await ingest(gw.key, { nothing: true })
    const list = await call('/api/admin/gateways', { cookie: gw.adminCookie })
    const row = list.body.find((g: { id: number }) => g.id === gw.id)
    expect(row).toMatchObject({ acceptedCount: 1, duplicateCount: 1, rejectedCount: 1, failedBatchCount: 1 })
    expect(row.lastContactAt).toBeTruthy()
    expect(JSON.stringify(list.body)).not.toContain(gw.key)
  })

  it('refuses a sample stamped an hour ahead of the server clock and counts it as rejected', async () => {
    const gw = await createTestGateway('fast-clock-gateway')
    const ahead = Date.now() + 3_600_000
    const res = await ingest(gw.key, { samples: [{ tag: 'TI-401', time: ahead, value: 1 }] })
    expect(res.status).toBe(200)
    expect(res.body.accepted).toBe(0)
    expect(res.body.rejected[0]).toMatchObject({ index: 0, field: 'time' })
    expect(res.body.rejected[0].reason).toMatch(/ahead of the receiving clock/)
    expect(await countFor('TI-401', ahead, ahead)).toBe(0)
    const list = await call('/api/admin/gateways', { cookie: gw.adminCookie })
    expect(list.body.find((g: { id: number }) => g.id === gw.id)).toMatchObject({ rejectedCount: 1, acceptedCount: 0 })
  })

  it('reports a conflicting duplicate (same tag and time, another value) as a conflict and keeps the stored reading', async () => {
    const gw = await createTestGateway('conflicting-gateway')
    const t = T0 + 7_200_000
    expect((await ingest(gw.key, { samples: [{ tag: 'TI-401', time: t, value: 20 }] })).body).toMatchObject({ accepted: 1 })
    const res = await ingest(gw.key, { samples: [
      { tag: 'TI-401', time: t, value: 20 },
      { tag: 'TI-401', time: t, value: 25 },
      { tag: 'TI-401', time: t + 5000, value: 21 },
      { tag: 'TI-401', time: t + 5000, value: 22 },
    ] })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ accepted: 1, duplicates: 1, conflicts: 2 })
    expect(res.body.rejected.map((r: { index: number, field: string }) => [r.index, r.field])).toEqual([[1, 'value'], [3, 'value']])
    expect(res.body.rejected[0].reason).toMatch(/conflicts with the reading already stored .*value 20.*this one 25/)
    const stored = await sql`select value from samples s join tags t on t.id = s.tag_id where t.code = 'TI-401' and s.time in (${new Date(t)}, ${new Date(t + 5000)}) order by s.time`
    expect(stored.map(r => r.value)).toEqual([20, 21])
    const list = await call('/api/admin/gateways', { cookie: gw.adminCookie })
    expect(list.body.find((g: { id: number }) => g.id === gw.id)).toMatchObject({ acceptedCount: 2, duplicateCount: 1, rejectedCount: 2 })
  })

  it('refuses impossible dates, implausible years and values beyond a ranged tag\'s physical bound, storing nothing', async () => {
    const { key } = await createTestGateway('careless-gateway')
    const res = await ingest(key, { samples: [
      { tag: 'TI-401', time: '2026-02-30T00:00:00Z', value: 20 },
      { tag: 'TI-401', time: '1970-01-01T00:00:00Z', value: 20 },
      { tag: 'TI-401', time: '2999-01-01T00:00:00Z', value: 20 },
      { tag: 'TI-401', time: '9999-12-31T23:59:59Z', value: 20 },
      { tag: 'TI-401', time: T0 + 9_000_000, value: 1e308 },
      { tag: 'TI-401', time: T0 + 9_005_000, value: -1e308 },
    ] })
    expect(res.status).toBe(200)
    expect(res.body.accepted).toBe(0)
    expect(res.body.rejected.map((r: { field: string }) => r.field)).toEqual(['time', 'time', 'time', 'time', 'value', 'value'])
    expect(res.body.rejected[0].reason).toMatch(/not a real date/)
    expect(res.body.rejected[1].reason).toMatch(/before 2000-01-01/)
    expect(res.body.rejected[4].reason).toMatch(/physical bound/)
    expect(await countFor('TI-401', Date.UTC(2026, 2, 2), Date.UTC(2026, 2, 2, 1))).toBe(0)
    expect(await countFor('TI-401', T0 + 9_000_000, T0 + 9_005_000)).toBe(0)
    const [far] = await sql`select count(*)::int as n from samples where time > now() + interval '1 day' or time < '2000-01-01'`
    expect(far!.n).toBe(0)
  })

  it('gives a gateway name conflict a 409 and a bad site a 400 naming the field', async () => {
    const gw = await createTestGateway('unique-gateway')
    const sites = await call('/api/sites', { cookie: gw.adminCookie })
    const dup = await call('/api/admin/gateways', { method: 'POST', cookie: gw.adminCookie, json: { siteId: sites.body[0].id, name: 'unique-gateway' } })
    expect(dup.status).toBe(409)
    const badSite = await call('/api/admin/gateways', { method: 'POST', cookie: gw.adminCookie, json: { siteId: 99999, name: 'x-gateway' } })
    expect(badSite.status).toBe(400)
    expect(badSite.body.message).toMatch(/^siteId:/)
  })
})
