// The rules editor's routes: rationale with time to respond required, enable/disable audited, and
// the 7-day preview through the live condition tracker with its chatter warning
// (≥ 3 activations in 60 s, EEMUA 191 [common practice]) and the priority spread (~80/15/5).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(() => sql.end())
let engineer = ''
let tagId = 0
const CODE = 'TT-901'
const START_MS = Date.UTC(2026, 0, 6, 8, 0, 0)
// 600 s of a square wave between 9 and 11 with a 20 s period: 30 rising edges through 10.
const SAMPLES = Array.from({ length: 600 }, (_, i) => ({
  tag: CODE, time: new Date(START_MS + i * 1000).toISOString(), value: Math.floor(i / 10) % 2 === 1 ? 11 : 9
}))

const rule = () => ({
  targetKind: 'tag', tagId, name: 'TT-901 high', measure: 'value', comparison: 'above', threshold: 10, deadband: 0, onDelayS: 0, offDelayS: 0,
  priority: 'low', alarmClass: 'alarm', consequence: 'Test vessel overflows.', likelyCause: 'Test inflow valve stuck open.',
  operatorAction: 'Close the test inflow valve.', timeToRespondS: 600,
})

beforeAll(async () => {
  await waitForDemoSite(sql)
  engineer = await signInAs('engineer')
  const [unit] = await sql`select code from units order by id limit 1`
  tagId = await createTestTag(sql, CODE, unit!.code, 1)
  await ingestAll(SAMPLES)
})

describe('rules editor', () => {
  it('requires every rationale field, time to respond included, naming the field', async () => {
    const { timeToRespondS: _, ...noTime } = rule()
    const missing = await call('/api/rules', { method: 'POST', cookie: engineer, json: noTime })
    expect(missing.status).toBe(400)
    expect(missing.body.message).toContain('timeToRespondS: is required (ISA-18.2 rationalization)')
    for (const field of ['consequence', 'likelyCause', 'operatorAction']) {
      const res = await call('/api/rules', { method: 'POST', cookie: engineer, json: { ...rule(), [field]: '  ' } })
      expect(res.status, field).toBe(400)
      expect(res.body.message, field).toContain(`${field}:`)
    }
    const negative = await call('/api/rules', { method: 'POST', cookie: engineer, json: { ...rule(), timeToRespondS: -5 } })
    expect(negative.body.message).toContain('timeToRespondS:')
  })

  it('previews the last 7 days through the live condition tracker and warns of chatter', async () => {
    const bare = await call('/api/rules/preview', { method: 'POST', cookie: engineer, json: { rule: rule() } })
    expect(bare.status).toBe(200)
    expect(bare.body.basis).toBe('raw samples')
    expect(bare.body.summary.count).toBe(30)
    expect(bare.body.activations[0]).toBe(START_MS / 1000 + 10)
    // Edges 20 s apart: 10, 30, 50, 70 s fall within one 60 s span.
    expect(bare.body.summary).toMatchObject({ chatter: true, maxInChatterWindow: 4, flood: true })
    expect(bare.body.timeZone).toBe('Europe/London')
    // A deadband wider than the swing holds the alarm after its first activation.
    const tuned = await call('/api/rules/preview', { method: 'POST', cookie: engineer, json: { rule: { ...rule(), deadband: 2 } } })
    expect(tuned.body.summary).toMatchObject({ count: 1, chatter: false, flood: false })
    // The demo site's alarm rules are far from 80/15/5 low/medium/high.
    expect(tuned.body.spread.departures.length).toBeGreaterThan(0)
    const operator = await signInAs('operator')
    expect((await call('/api/rules/preview', { method: 'POST', cookie: operator, json: { rule: rule() } })).status).toBe(403)
  })

  it('creates the rule, disables and re-enables it, each change audited', async () => {
    const created = await call('/api/rules', { method: 'POST', cookie: engineer, json: { ...rule(), deadband: 2 } })
    expect(created.status).toBe(201)
    expect(created.body.timeToRespondS).toBe(600)
    const off = await call(`/api/rules/${created.body.id}`, { method: 'PATCH', cookie: engineer, json: { enabled: false } })
    expect(off.status).toBe(200)
    expect((await call(`/api/rules?tagId=${tagId}`, { cookie: engineer })).body).toEqual([])
    const all = await call(`/api/rules?tagId=${tagId}&disabled=include`, { cookie: engineer })
    expect(all.body.map((r: { id: number, enabled: boolean }) => [r.id, r.enabled])).toEqual([[created.body.id, false]])
    const [audit] = await sql`select detail from audit_log where action = 'alarm_rule.update' order by id desc limit 1`
    expect(audit!.detail.changed).toEqual({ enabled: { from: true, to: false } })
    expect((await call(`/api/rules/${created.body.id}`, { method: 'PATCH', cookie: engineer, json: { enabled: 'yes' } })).body.message).toContain('enabled:')
  })
})
