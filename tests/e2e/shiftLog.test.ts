import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { testSql } from '../support/db'

await setupBuiltServer()
const sql = testSql()
afterAll(() => sql.end())

let operator = ''
const tag: Record<string, { id: number, unitId: number }> = {}
beforeAll(async () => {
  operator = await signInAs('operator')
  const tags = await call('/api/tags', { cookie: operator })
  for (const t of tags.body) tag[t.code] = { id: t.id, unitId: t.unitId }
})

describe('POST /api/shift-log', () => {
  it('stores a note linked to a tag, taking the unit from the tag, with the author', async () => {
    const res = await call('/api/shift-log', { method: 'POST', cookie: operator, json: { body: '  Cooling water valve cycled by hand at 14:05.  ', tagId: tag['TI-101']!.id } })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({ body: 'Cooling water valve cycled by hand at 14:05.', tagCode: 'TI-101', unitId: tag['TI-101']!.unitId, authorName: 'Olu Mensah' })
    const [row] = await sql`select author_id, unit_id from shift_log_notes where id = ${res.body.id}`
    expect(row!.unit_id).toBe(tag['TI-101']!.unitId)
  })

  it.each([
    [{ body: '' }, /body: must not be empty/],
    [{ body: 'x', at: new Date(Date.now() + 3_600_000).toISOString() }, /at: must not be in the future/],
    [{ body: 'x', at: new Date(Date.now() - 13 * 3_600_000).toISOString() }, /at: must be within the last 12 hours/],
    // Zone-less: read as server-local it would shift by the server's offset; ingest refuses it too.
    [{ body: 'x', at: new Date(Date.now() - 60_000).toISOString().slice(0, 19) }, /at: must name its time-zone offset/],
    [{ body: 'x', tagId: 'TI-101' }, /tagId: must be a number/],
    [{ body: 'x', alarmId: 987654 }, /alarmId: alarm 987654 does not exist/],
  ])('refuses %j naming the field', async (json, message) => {
    const res = await call('/api/shift-log', { method: 'POST', cookie: operator, json })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(message)
  })

  it('refuses a tag that is not on the linked unit', async () => {
    const res = await call('/api/shift-log', { method: 'POST', cookie: operator, json: { body: 'x', unitId: tag['TI-401']!.unitId, tagId: tag['TI-101']!.id } })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/tagId: tag \d+ is not on unit/)
  })

  it('lets operators, engineers and supervisors write; admins and strangers may not (docs/design.md §D2.1)', async () => {
    for (const role of ['engineer', 'supervisor'] as const) {
      const cookie = await signInAs(role)
      expect((await call('/api/shift-log', { method: 'POST', cookie, json: { body: `${role} note` } })).status).toBe(201)
    }
    const admin = await signInAs('admin')
    expect((await call('/api/shift-log', { method: 'POST', cookie: admin, json: { body: 'admin note' } })).status).toBe(403)
    expect((await call('/api/shift-log', { method: 'POST', json: { body: 'anonymous' } })).status).toBe(401)
    expect((await call('/api/shift-log', { cookie: admin })).status).toBe(200)
  })
})

describe('GET /api/shift-log', () => {
  it('hands over the last 12 h in order; older notes stay in the recent view only', async () => {
    const [site] = await sql`select id from sites limit 1`
    await sql`insert into shift_log_notes (site_id, at, body) values (${site!.id}, now() - interval '13 hours', 'previous shift: pump P-12 tripped')`
    const recent = await call('/api/shift-log?view=recent', { cookie: operator })
    const handover = await call('/api/shift-log?view=handover', { cookie: operator })
    const bodies = (r: typeof recent) => r.body.map((n: { body: string }) => n.body)
    expect(bodies(recent)).toContain('previous shift: pump P-12 tripped')
    expect(bodies(handover)).not.toContain('previous shift: pump P-12 tripped')
    expect(bodies(handover)).toContain('Cooling water valve cycled by hand at 14:05.')
    const times = handover.body.map((n: { at: string }) => Date.parse(n.at))
    expect(times).toEqual([...times].sort((a, b) => a - b))
    expect(Date.parse(recent.body[0].at)).toBeGreaterThanOrEqual(Date.parse(recent.body.at(-1).at))
  })

  it('filters by tag and names a bad view', async () => {
    const byTag = await call(`/api/shift-log?tagId=${tag['TI-101']!.id}`, { cookie: operator })
    expect(byTag.body.every((n: { tagCode: string }) => n.tagCode === 'TI-101')).toBe(true)
    expect(byTag.body.length).toBeGreaterThan(0)
    const bad = await call('/api/shift-log?view=yesterday', { cookie: operator })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/view: must be recent or handover/)
  })
})
