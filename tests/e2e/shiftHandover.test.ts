import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { tick, waitForDemoSite } from '../support/pipeline'
import { activation, insertOccurrence, insertRule } from '../support/reviewFixtures'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(async () => { await sql.end() })
const HOUR = 3_600_000
let operator = ''
const ids: Record<string, number> = {}

beforeAll(async () => {
  await waitForDemoSite(sql)
  operator = await signInAs('operator')
  const now = Date.now()
  ids.recent = await insertOccurrence(sql, await insertRule(sql, { unitCode: 'T-400', name: 'Handover recent' }), [activation(now - HOUR)], null)
  ids.old = await insertOccurrence(sql, await insertRule(sql, { unitCode: 'D-200', name: 'Handover old' }), [activation(now - 30 * HOUR)], null)
  const shelved = async (name: string, untilMs: number) => {
    const id = await insertOccurrence(sql, await insertRule(sql, { unitCode: 'R-100', name }), [activation(now - 2 * HOUR),
      { at: now - HOUR, event: 'shelve', from: 'unacknowledged', to: 'shelved' }], null)
    await sql`update alarms set shelved_until = ${new Date(untilMs).toISOString()}::timestamptz, shelve_reason = 'valve work' where id = ${id}`
    return id
  }
  ids.shelvedSoon = await shelved('Handover shelved soon', now + 2 * HOUR)
  ids.shelvedLater = await shelved('Handover shelved later', now + 13 * HOUR)
  await tick()
})

describe('GET /api/shift-log/handover', () => {
  it('the last shift\'s notes, standing alarms (this shift marked), shelves ending in the next 12 h and incidents not closed', async () => {
    const note = await call('/api/shift-log', { method: 'POST', cookie: operator, json: { body: 'Handover: feed pump B on standby.' } })
    expect(note.status).toBe(201)
    const res = await call('/api/shift-log/handover', { cookie: operator })
    expect(res.status).toBe(200)
    expect(res.body.advisory).toBe(ADVISORY_CAUTION)
    expect(res.body.notes.map((n: { body: string }) => n.body)).toContain('Handover: feed pump B on standby.')
    const alarm = (id: number) => res.body.alarms.find((a: { id: number }) => a.id === id)
    expect(alarm(ids.recent!)).toMatchObject({ raisedThisShift: true })
    expect(alarm(ids.old!)).toMatchObject({ raisedThisShift: false })
    // Shelved ones are listed apart, and only those whose shelve ends within the next shift (12 h [common practice]).
    expect(alarm(ids.shelvedSoon!)).toBeUndefined()
    const shelvedIds = res.body.shelvedEnding.map((a: { id: number }) => a.id)
    expect(shelvedIds).toContain(ids.shelvedSoon)
    expect(shelvedIds).not.toContain(ids.shelvedLater)
    // The tick grouped the standing alarms into incidents, all open.
    const incidentOfRecent = Number((await sql`select incident_id from incident_alarms where alarm_id = ${ids.recent!}`)[0]!.incident_id)
    expect(res.body.openIncidents.map((i: { id: number }) => i.id)).toContain(incidentOfRecent)
    expect((await call('/api/shift-log/handover')).status).toBe(401)
  })
})
