import { beforeAll, describe, expect, it } from 'vitest'
import { CATALOGUE } from '../../shared/demo/catalogue'
import type { OverviewUnit } from '../../shared/types/overview'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { createTestGateway, ingest } from '../support/gateway'

await setupBuiltServer()

let cookie = ''
// JI-302 (2 s period) gets fresh samples; EI-301 (2 s) samples that stopped 60 s ago, more than
// 3 sample periods and the 15 s floor. Stamped once the server is up, so a slow start on a
// loaded machine cannot age the "fresh" ones past the limit.
let fresh: { tag: string, time: number, value: number }[] = []
let stopped: typeof fresh = []

beforeAll(async () => {
  const { key } = await createTestGateway('overview-gateway')
  const now = Date.now()
  fresh = Array.from({ length: 120 }, (_, i) => ({ tag: 'JI-302', time: now - (119 - i) * 2_000, value: 50 + (i % 7) }))
  stopped = Array.from({ length: 30 }, (_, i) => ({ tag: 'EI-301', time: now - 60_000 - (29 - i) * 2_000, value: 0.98 }))
  expect((await ingest(key, { samples: [...fresh, ...stopped] })).status).toBe(200)
  cookie = await signInAs('operator')
})

const tileOf = (body: { units: OverviewUnit[] }, code: string) =>
  body.units.flatMap(u => u.tiles).find(t => t.code === code)!

describe('GET /api/overview', () => {
  it('groups every watched tag under its unit', async () => {
    const res = await call('/api/overview', { cookie })
    expect(res.status).toBe(200)
    expect(res.body.units.map((u: { code: string }) => u.code)).toEqual(CATALOGUE.map(u => u.name.split(' ')[0]).sort())
    expect(res.body.units.flatMap((u: { tiles: unknown[] }) => u.tiles)).toHaveLength(CATALOGUE.flatMap(u => u.tags).length)
  })

  it('shows the newest value and a sparkline of the newest samples, averaged in threes', async () => {
    const tile = tileOf((await call('/api/overview', { cookie })).body, 'JI-302')
    expect(tile.value).toBe(fresh.at(-1)!.value)
    expect(tile.engineeringUnit).toBe('MW')
    expect(tile.spark).toHaveLength(32)
    const lastThree = fresh.slice(-3).map(s => s.value)
    // Sent with four significant digits (server/services/reads/overviewSparklines.ts).
    expect(tile.spark.at(-1)).toBeCloseTo(lastThree.reduce((a, b) => a + b, 0) / 3, 1)
    expect(tile.status).not.toBe('no data')
  })

  it('says "no data" when samples stopped for more than 3 sample periods', async () => {
    const tile = tileOf((await call('/api/overview', { cookie })).body, 'EI-301')
    expect(tile.status).toBe('no data')
    expect(tile.reason).toMatch(/no sample for \d+ s \(limit 15 s\)/)
    expect(tile.value).toBe(0.98)
  })

  it('says how often each tag\'s trend tests run (issue 12 item 5)', async () => {
    // evaluateEvery 20 samples (docs/science.md §S8.2) times the sample period: AI-102 every
    // 30 s, so τ and p move every 10 min; JI-302 every 2 s, every 40 s.
    const body = (await call('/api/overview', { cookie })).body
    expect(tileOf(body, 'AI-102').trendEverySeconds).toBe(600)
    expect(tileOf(body, 'JI-302').trendEverySeconds).toBe(40)
    // No trend test has run in this database yet (no pipeline tick was asked for).
    expect(tileOf(body, 'AI-102').trendTestedAt).toBeNull()
  })

  it('needs a session', async () => {
    expect((await call('/api/overview')).status).toBe(401)
  })
})
