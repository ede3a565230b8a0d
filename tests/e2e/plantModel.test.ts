import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { testSql } from '../support/db'
import { activation, insertOccurrence, insertRule } from '../support/reviewFixtures'

await setupBuiltServer()
const sql = testSql()
afterAll(async () => { await sql.end() })

let engineer = ''
beforeAll(async () => { engineer = await signInAs('engineer') })
const NEW_TAG = {
  code: 'FIC-701', description: 'Feed flow controller', engineeringUnit: 'm3/h', samplePeriodS: 5,
  rangeLow: 0, rangeHigh: 40, noiseFloor: 0.05, quantisationStep: 0.01,
}

describe('plant model: sites, units and tags (engineers only, audited, history kept)', () => {
  it('refuses every role but the engineer, on the server', async () => {
    for (const role of ['operator', 'supervisor', 'admin'] as const) {
      const cookie = await signInAs(role)
      const res = await call('/api/sites', { method: 'POST', cookie, json: { code: 'X', name: 'Xx', company: 'Xx', timeZone: 'UTC' } })
      expect(res.status, role).toBe(403)
      expect((await call('/api/plant-model', { cookie })).status, role).toBe(403)
    }
  })

  it('creates a site with its plant time zone, a unit and a tag, each audited', async () => {
    const site = await call('/api/sites', { method: 'POST', cookie: engineer, json: { code: 'nw', name: 'Northwick works', company: 'Example Ltd', timeZone: 'America/Chicago' } })
    expect(site.status).toBe(201)
    expect(site.body).toMatchObject({ code: 'NW', timeZone: 'America/Chicago', retiredAt: null })
    const unit = await call('/api/units', { method: 'POST', cookie: engineer, json: { siteId: site.body.id, code: 'F-700', name: 'Feed train', kind: 'feed' } })
    expect(unit.status).toBe(201)
    const tag = await call('/api/tags', { method: 'POST', cookie: engineer, json: { ...NEW_TAG, unitId: unit.body.id } })
    expect(tag.status).toBe(201)
    expect(tag.body).toMatchObject({ ...NEW_TAG, siteId: site.body.id, watched: true, loopTagId: null })
    // A code is unique per site (ISA-5.1 tag numbers identify one instrument in a plant) [common practice].
    const again = await call('/api/tags', { method: 'POST', cookie: engineer, json: { ...NEW_TAG, unitId: unit.body.id } })
    expect(again.status).toBe(409)
    expect(again.body.message).toBe('code: a tag called "FIC-701" already exists on this site')
    const unitAgain = await call('/api/units', { method: 'POST', cookie: engineer, json: { siteId: site.body.id, code: 'F-700', name: 'Feed train', kind: 'feed' } })
    expect(unitAgain.status).toBe(409)
    expect(unitAgain.body.message).toBe('code: a unit with code "F-700" already exists on this site')
    const audit = await sql`select action, detail from audit_log where action in ('site.create', 'unit.create', 'tag.create') order by id`
    expect(audit.map(a => a.action)).toEqual(['site.create', 'unit.create', 'tag.create'])
    expect(audit[2]!.detail.after).toMatchObject({ code: 'FIC-701', samplePeriodS: 5 })
  })

  it('answers 400 naming the field for bad values, and 409 for a duplicate code', async () => {
    const [unit] = await sql`select id from units where code = 'F-700'`
    const cases: [Record<string, unknown>, string][] = [
      [{ code: 'flow 7' }, 'code'], [{ samplePeriodS: 0 }, 'samplePeriodS'], [{ rangeHigh: -1 }, 'rangeHigh'],
      [{ noiseFloor: -2 }, 'noiseFloor'], [{ quantisationStep: 'fine' }, 'quantisationStep'], [{ unitId: 99999 }, 'unitId'],
      [{ loopTagId: 99999, loopRole: 'setpoint' }, 'loopTagId'],
    ]
    for (const [change, field] of cases) {
      const res = await call('/api/tags', { method: 'POST', cookie: engineer, json: { ...NEW_TAG, code: 'FI-799', unitId: unit!.id, ...change } })
      expect(res.status, field).toBe(400)
      expect(res.body.message, field).toContain(`${field}:`)
    }
    const dup = await call('/api/tags', { method: 'POST', cookie: engineer, json: { ...NEW_TAG, unitId: unit!.id } })
    expect(dup.status).toBe(409)
    expect(dup.body.message).toContain('code:')
    const zone = await call('/api/sites', { method: 'POST', cookie: engineer, json: { code: 'ZZ', name: 'Zz site', company: 'Zz', timeZone: 'Europe/Atlantis' } })
    expect(zone.status).toBe(400)
    expect(zone.body.message).toContain('timeZone:')
  })

  it('links a tag as the controller output of another tag\'s loop and audits the edit with before and after', async () => {
    const [pv] = await sql`select id, unit_id from tags where code = 'FIC-701'`
    const out = await call('/api/tags', { method: 'POST', cookie: engineer, json: { ...NEW_TAG, code: 'FV-701', description: 'Feed valve position', engineeringUnit: '%', rangeHigh: 100, unitId: pv!.unit_id } })
    expect(out.status).toBe(201)
    const patch = await call(`/api/tags/${out.body.id}`, { method: 'PATCH', cookie: engineer, json: { loopTagId: pv!.id, loopRole: 'controller_output', noiseFloor: 0.2 } })
    expect(patch.status).toBe(200)
    expect(patch.body).toMatchObject({ loopTagId: pv!.id, loopRole: 'controller_output' })
    const [audit] = await sql`select detail from audit_log where action = 'tag.update' order by id desc limit 1`
    expect(audit!.detail.changed).toEqual({
      noiseFloor: { from: 0.05, to: 0.2 }, loopTagId: { from: null, to: pv!.id }, loopRole: { from: null, to: 'controller_output' },
    })
    // The edit is checked on the tag as it would become: a range low above the stored high is refused.
    const bad = await call(`/api/tags/${out.body.id}`, { method: 'PATCH', cookie: engineer, json: { rangeLow: 150 } })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toContain('rangeHigh:')
    const self = await call(`/api/tags/${pv!.id}`, { method: 'PATCH', cookie: engineer, json: { loopTagId: pv!.id, loopRole: 'setpoint' } })
    expect(self.status).toBe(400)
    expect(self.body.message).toContain('loopTagId:')
  })

  it('retiring a demo tag keeps its samples, points and alarms; it leaves the lists and can be restored', async () => {
    const [tag] = await sql`select id from tags where code = 'TI-101'`
    await sql`insert into samples (tag_id, time, value, quality) select ${tag!.id}, now() - g * interval '1 s', 350, 0 from generate_series(1, 50) g on conflict do nothing`
    const count = async () => (await sql`select (select count(*) from samples where tag_id = ${tag!.id})::int as samples,
      (select count(*) from indicator_points where tag_id = ${tag!.id})::int as points,
      (select count(*) from alarm_rules where tag_id = ${tag!.id})::int as rules`)[0]
    const before = await count()
    expect(before!.samples).toBeGreaterThanOrEqual(50)
    const retired = await call(`/api/tags/${tag!.id}/retire`, { method: 'POST', cookie: engineer })
    expect(retired.status).toBe(200)
    expect(retired.body.retiredAt).not.toBeNull()
    expect(retired.body.watched).toBe(false)
    expect(await count()).toEqual(before)
    const list = await call('/api/tags', { cookie: engineer })
    expect(list.body.map((t: { code: string }) => t.code)).not.toContain('TI-101')
    // Its charts stay readable.
    expect((await call(`/api/tags/${tag!.id}/series?range=1h`, { cookie: engineer })).status).toBe(200)
    const unitRetire = await call(`/api/units/${(await sql`select unit_id from tags where id = ${tag!.id}`)[0]!.unit_id}/retire`, { method: 'POST', cookie: engineer })
    expect(unitRetire.status).toBe(409)
    const restored = await call(`/api/tags/${tag!.id}/restore`, { method: 'POST', cookie: engineer })
    expect(restored.body).toMatchObject({ retiredAt: null, watched: true })
    const audit = await sql`select action, detail from audit_log where action in ('tag.retire', 'tag.restore') order by id`
    expect(audit.map(a => a.action)).toEqual(['tag.retire', 'tag.restore'])
    expect(audit[0]!.detail.changed.watched).toEqual({ from: true, to: false })
    expect(await count()).toEqual(before)
  })

  it('retiring a tag takes its standing alarm out of service, by name; restoring returns it to service', async () => {
    const [tag] = await sql`select id from tags where code = 'FI-203'`
    const rule = await insertRule(sql, { unitCode: 'D-200', tagCode: 'FI-203', priority: 'high' })
    const alarmId = await insertOccurrence(sql, rule, [activation(Date.now() - 60_000)], null)
    const stateOf = async () => (await sql`select state, closed_at from alarms where id = ${alarmId}`)[0]!
    expect((await stateOf()).state).toBe('unacknowledged')
    expect((await call(`/api/tags/${tag!.id}/retire`, { method: 'POST', cookie: engineer })).status).toBe(200)
    // ISA-18.2 state H: an alarm of equipment out of use is out of service, not standing [common practice].
    expect((await stateOf()).state).toBe('out_of_service')
    const [removed] = await sql`select event, comment, user_id from alarm_events where alarm_id = ${alarmId} order by id desc limit 1`
    expect(removed).toMatchObject({ event: 'remove_from_service', comment: 'tag FI-203 retired' })
    expect(removed!.user_id).not.toBeNull()
    const [audit] = await sql`select detail from audit_log where action = 'tag.retire' order by id desc limit 1`
    expect(audit!.detail.alarmsMoved).toBe(1)
    expect((await call(`/api/tags/${tag!.id}/restore`, { method: 'POST', cookie: engineer })).status).toBe(200)
    // Back in service, a condition last seen active is annunciated again (ISA-18.2 on return to
    // service; shared/alarms/lifecycle.ts) until the watched tag's data say otherwise.
    expect((await stateOf()).state).toBe('unacknowledged')
    const events = await sql`select event, comment from alarm_events where alarm_id = ${alarmId} order by id`
    expect(events.map(e => e.event)).toEqual(['activate', 'remove_from_service', 'return_to_service'])
    expect(events[2]!.comment).toBe('tag FI-203 restored')
  })
})
