// Indicator settings per tag on the workbench: starting values from the sample period
// (shared/pipeline/indicatorDefaults), a refused bad value names its field, saving writes a
// version that later indicator points name, and the preview runs both settings over the same history.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { defaultIndicatorSettings } from '../../shared/pipeline/indicatorDefaults'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { ingestOu } from '../support/simulatedSamples'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(() => sql.end())
let engineer = ''
let tagId = 0
const CODE = 'TT-801'
// Fixed sample times: the live bootstrap is seeded from (tag, time), so the run is reproducible.
const END_MS = Date.UTC(2026, 0, 5, 6, 0, 0)
beforeAll(async () => {
  await waitForDemoSite(sql)
  engineer = await signInAs('engineer')
  const [unit] = await sql`select code from units order by id limit 1`
  tagId = await createTestTag(sql, CODE, unit!.code, 1)
  await ingestOu(process.env.BRINKLINE_SIM_KEY!,
    { code: CODE, periodS: 1, samples: 1600, endMs: END_MS - 200_000, mean: 400, k: 0.3, sigma: 0.5, seed: 21 })
  await runServerTask('indicators:refresh')
})

describe('indicator settings of a tag', () => {
  it('starts from the defaults of its sample period and lists no version', async () => {
    const res = await call(`/api/tags/${tagId}/indicator-settings`, { cookie: engineer })
    expect(res.status).toBe(200)
    expect(res.body.current).toEqual(defaultIndicatorSettings(1))
    expect(res.body.defaults).toEqual(defaultIndicatorSettings(1))
    expect(res.body.versions).toEqual([])
    expect(res.body.timeZone).toBe('Europe/London')
    expect(res.body.pointsByVersion).toEqual([expect.objectContaining({ versionId: null })])
  })

  it('is for engineers only', async () => {
    const operator = await signInAs('operator')
    expect((await call(`/api/tags/${tagId}/indicator-settings`, { cookie: operator })).status).toBe(403)
    const put = await call(`/api/tags/${tagId}/indicator-settings`, { method: 'PUT', cookie: operator, json: { settings: defaultIndicatorSettings(1) } })
    expect(put.status).toBe(403)
  })

  it('refuses bad values naming the field', async () => {
    const good = defaultIndicatorSettings(1)
    const cases: [Record<string, unknown>, string][] = [
      [{ windowSamples: 5 }, 'settings.windowSamples'], [{ windowSamples: 2.5 }, 'settings.windowSamples'],
      [{ trendWindowSamples: 250 }, 'settings.trendWindowSamples'], [{ minTrendSamples: 5000 }, 'settings.minTrendSamples'],
      [{ alpha: 0 }, 'settings.alpha'], [{ surrogates: 3 }, 'settings.surrogates'], [{ detrendBandwidthS: -1 }, 'settings.detrendBandwidthS'],
    ]
    for (const [change, field] of cases) {
      const res = await call(`/api/tags/${tagId}/indicator-settings`, { method: 'PUT', cookie: engineer, json: { settings: { ...good, ...change } } })
      expect(res.status, field).toBe(400)
      expect(res.body.message, field).toContain(`${field}:`)
    }
    const [row] = await sql`select window_samples, version_id from indicator_settings where tag_id = ${tagId}`
    expect(row).toEqual({ window_samples: 300, version_id: null })
  })

  it('previews the proposed settings beside the current ones over the same history', async () => {
    const proposed = { ...defaultIndicatorSettings(1), windowSamples: 100 }
    const res = await call(`/api/tags/${tagId}/indicator-settings/preview`, { method: 'POST', cookie: engineer, json: { settings: proposed, range: '1h' } })
    expect(res.status).toBe(200)
    expect(res.body.settings.current.windowSamples).toBe(300)
    expect(res.body.settings.proposed.windowSamples).toBe(100)
    expect(res.body.time).toHaveLength(res.body.current.variance.length)
    expect(res.body.proposed.variance).toHaveLength(res.body.current.variance.length)
    expect(res.body.proposed.variance).not.toEqual(res.body.current.variance)
    expect(res.body.lookTime.length).toBeGreaterThan(0)
    expect(res.body.proposed.p).toHaveLength(res.body.lookTime.length)
    // The range ends at the tag's newest sample (fixed in the past here), not at the wall clock.
    expect(res.body.to).toBeCloseTo((END_MS - 200_000) / 1000 + 1, 0)
    const range = await call(`/api/tags/${tagId}/indicator-settings/preview`, { method: 'POST', cookie: engineer, json: { settings: proposed, range: '7d' } })
    expect(range.status).toBe(400)
    expect(range.body.message).toContain('range:')
  })

  it('saves a version, audits before/after, and the next points name it; earlier points name the starting values', async () => {
    const before = (await sql`select count(*)::int as n from indicator_points where tag_id = ${tagId}`)[0]!.n
    expect(before).toBeGreaterThan(0)
    const settings = { ...defaultIndicatorSettings(1), windowSamples: 200 }
    const res = await call(`/api/tags/${tagId}/indicator-settings`, { method: 'PUT', cookie: engineer, json: { settings, reason: 'faster response' } })
    expect(res.status).toBe(200)
    expect(res.body.changed).toEqual({ windowSamples: { from: 300, to: 200 } })
    const [audit] = await sql`select detail from audit_log where action = 'indicator_settings.update' order by id desc limit 1`
    expect(audit!.detail).toMatchObject({ id: tagId, versionId: res.body.versionId, reason: 'faster response', changed: { windowSamples: { from: 300, to: 200 } } })

    const read = await call(`/api/tags/${tagId}/indicator-settings`, { cookie: engineer })
    expect(read.body.current.windowSamples).toBe(200)
    expect(read.body.versionId).toBe(res.body.versionId)
    expect(read.body.versions.map((v: { reason: string }) => v.reason)).toEqual(['faster response', 'starting values, in force before the first edit'])
    const start = read.body.versions[1].id
    expect(read.body.versions[1].settings).toEqual(defaultIndicatorSettings(1))
    expect(read.body.pointsByVersion).toEqual([expect.objectContaining({ versionId: start, count: before })])

    await ingestOu(process.env.BRINKLINE_SIM_KEY!,
      { code: CODE, periodS: 1, samples: 200, endMs: END_MS, mean: 400, k: 0.3, sigma: 0.5, seed: 22 })
    await runServerTask('indicators:refresh')
    const byVersion = await sql`select settings_version_id as v, count(*)::int as n from indicator_points where tag_id = ${tagId} group by 1 order by 1`
    expect(byVersion).toEqual([{ v: start, n: before }, { v: res.body.versionId, n: 200 / settings.evaluateEvery }])
  })
})
