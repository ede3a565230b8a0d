import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { waitForDemoSite } from '../support/pipeline'
import { activation, insertOccurrence, insertRule, oneShot } from '../support/reviewFixtures'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(async () => { await sql.end() })

// A past hour no demo data reaches, filled with a stated sequence: every expected value below
// is counted by hand from the definitions in docs/science.md §S7.4 (ISA-18.2 / IEC 62682, EEMUA 191).
const MIN = 60_000
const T0 = Date.UTC(2026, 0, 5, 0, 0, 0)
const HOUR = `from=${new Date(T0).toISOString()}&to=${new Date(T0 + 60 * MIN).toISOString()}`
const T1 = Date.UTC(2026, 0, 6, 0, 0, 0)
let operator = ''
let siteId = 0

beforeAll(async () => {
  await waitForDemoSite(sql)
  operator = await signInAs('operator')
  siteId = (await sql`select id from sites limit 1`)[0]!.id as number
  // First ten minutes: one rule re-activating 4 times within 50 s (chattering) and 8 other
  // alarms, 12 annunciations in all: a flood period (> 10).
  const chatter = await insertRule(sql, { unitCode: 'T-400', name: 'health fixture chatter' })
  const ev = (at: number, event: string, from: string, to: string) => ({ at, event, from, to })
  await insertOccurrence(sql, chatter, [
    activation(T0 + MIN),
    ...[1, 2, 3].flatMap(k => [ev(T0 + MIN + k * 15_000 - 5000, 'return', 'unacknowledged', 'rtn_unacknowledged'),
      ev(T0 + MIN + k * 15_000, 'activate', 'rtn_unacknowledged', 'unacknowledged')]),
  ], T0 + 2 * MIN)
  const priorities = ['low', 'low', 'low', 'low', 'low', 'low', 'medium', 'high']
  for (const [i, priority] of priorities.entries()) await oneShot(sql, await insertRule(sql, { unitCode: 'T-400', priority }), T0 + 3 * MIN + i * 1000)
  // Second ten minutes: one advisory alert, counted apart.
  await oneShot(sql, await insertRule(sql, { unitCode: 'T-400', alarmClass: 'alert', measure: 'early_warning' }), T0 + 12 * MIN)
  // Raised two days before and still standing: stale through the whole hour, annunciated outside it.
  await insertOccurrence(sql, await insertRule(sql, { unitCode: 'T-400' }), [activation(T0 - 2 * 24 * 60 * MIN)], null)
  // Shelved for 20 minutes inside the hour.
  await insertOccurrence(sql, await insertRule(sql, { unitCode: 'T-400' }), [
    activation(T0 - 5 * MIN), ev(T0 + 30 * MIN, 'shelve', 'unacknowledged', 'shelved'), ev(T0 + 50 * MIN, 'unshelve', 'shelved', 'unacknowledged'),
    ev(T0 + 55 * MIN, 'return', 'unacknowledged', 'rtn_unacknowledged')], T0 + 55 * MIN)
})

describe('GET /api/review/health', () => {
  it('counts the hour as the standards define the figures, each with its target and source', async () => {
    const res = await call(`/api/review/health?${HOUR}`, { cookie: operator })
    expect(res.status).toBe(200)
    expect(res.body.advisory).toBe(ADVISORY_CAUTION)
    expect(res.body.site.id).toBe(siteId)
    const r = res.body.report
    expect(r.tenMinutePeriods).toBe(6)
    expect(r.alarms).toMatchObject({ count: 12, peakPer10Min: 12, floodPeriods: 1 })
    expect(r.alarms.averagePer10Min).toBeCloseTo(2, 12)
    expect(r.alarms.floodShare).toBeCloseTo(1 / 6, 12)
    expect(r.series.alarms).toEqual([12, 0, 0, 0, 0, 0])
    // Advisory alerts apart (ISA-18.2-2016 alerts).
    expect(r.alerts.count).toBe(1)
    expect(r.series.alerts).toEqual([0, 1, 0, 0, 0, 0])
    // Chattering: ≥ 3 activations in 60 s (4 within 45 s); run lengths 15 s each → index 1/15.
    expect(r.chattering).toHaveLength(1)
    expect(r.chattering[0]).toMatchObject({ ruleName: 'health fixture chatter', count: 4, mostIn60s: 4 })
    expect(r.chattering[0].chatterIndex).toBeCloseTo(1 / 15, 12)
    // Stale: standing more than 24 h (ISA-18.2).
    expect(r.stale.count).toBe(1)
    expect(r.shelved).toMatchObject({ count: 1, totalMs: 20 * MIN, longestMs: 20 * MIN, standing: 0 })
    expect(r.priorities.map((p: { priority: string, count: number }) => [p.priority, p.count]))
      .toEqual([['urgent', 0], ['high', 1], ['medium', 1], ['low', 10]])
    const figure = (key: string) => res.body.figures.find((f: { key: string }) => f.key === key)
    expect(figure('peakPer10Min')).toMatchObject({ value: 12, assessment: 'misses', source: 'ISA-18.2 / IEC 62682' })
    expect(figure('averagePer10Min')).toMatchObject({ assessment: 'near', source: 'EEMUA 191; ISA-18.2 / IEC 62682' })
    expect(figure('chattering')).toMatchObject({ value: 1, assessment: 'misses' })
  })

  it('the early-warning record: leads 1200 s and 600 s give a median of 900 s; an alert nothing followed, marked averted', async () => {
    const alert = () => insertRule(sql, { unitCode: 'T-400', alarmClass: 'alert', measure: 'early_warning' })
    const limit = () => insertRule(sql, { unitCode: 'T-400', priority: 'high' })
    const incident = async (alarmIds: number[]) => {
      const [i] = await sql`insert into incidents (site_id, unit_id, origin) select site_id, id, 'automatic' from units where code = 'T-400' returning id`
      for (const alarmId of alarmIds) await sql`insert into incident_alarms (alarm_id, incident_id) values (${alarmId}, ${i!.id})`
    }
    await incident([await oneShot(sql, await alert(), T1), await oneShot(sql, await limit(), T1 + 20 * MIN)])
    await incident([await oneShot(sql, await alert(), T1 + 30 * MIN), await oneShot(sql, await limit(), T1 + 40 * MIN)])
    const lone = await oneShot(sql, await alert(), T1 + 50 * MIN)
    await incident([lone])
    await sql`insert into alert_outcomes (alarm_id, outcome) values (${lone}, 'averted')`
    const res = await call(`/api/review/health?from=${new Date(T1).toISOString()}&to=${new Date(T1 + 60 * MIN).toISOString()}`, { cookie: operator })
    expect(res.status).toBe(200)
    expect(res.body.earlyWarning).toHaveLength(1)
    expect(res.body.earlyWarning[0]).toMatchObject({
      unitCode: 'T-400', limitAlarmIncidents: 2, warnedBefore: 2, medianLeadS: 900,
      unfollowedByOutcome: { false: 0, averted: 1, unmarked: 0 },
    })
  })

  it('needs a session; bad periods and unknown sites answer 4xx naming the field', async () => {
    expect((await call(`/api/review/health?${HOUR}`)).status).toBe(401)
    const backwards = await call(`/api/review/health?from=${new Date(T0).toISOString()}&to=${new Date(T0 - MIN).toISOString()}`, { cookie: operator })
    expect(backwards.status).toBe(400)
    expect(backwards.body.message).toContain('to: must be after from')
    const long = await call(`/api/review/health?from=2025-01-01T00:00:00Z&to=2025-06-01T00:00:00Z`, { cookie: operator })
    expect(long.status).toBe(400)
    expect(long.body.message).toContain('from: must be at most 92 days')
    const junk = await call(`/api/review/health?from=yesterday`, { cookie: operator })
    expect(junk.status).toBe(400)
    expect(junk.body.message).toContain('from')
    const missing = await call(`/api/review/health?siteId=987654&${HOUR}`, { cookie: operator })
    expect(missing.status).toBe(404)
    expect(missing.body.message).toContain('siteId')
  })
})
