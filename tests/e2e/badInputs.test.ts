import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { createTestGateway, ingest } from '../support/gateway'
import { waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import type { Role } from '../../shared/utils/roles'

// Inputs that once answered 500 (issue 13 item 3): each must be a 4xx naming the field, and
// nothing may be stored. Bounds: PostgreSQL `integer` ids end at 2^31 − 1 and text values may not
// hold U+0000 (PostgreSQL manual, "Numeric Types" and "Character Types" [from memory]); ISO 8601
// writes years with four digits (ISO 8601-1:2019 §5.2.2, wider years only by agreement [from memory]).

await setupBuiltServer()
const sql = testSql()
const cookies = new Map<Role, string>()
let siteId = 0
let tagId = 0
let unitId = 0
afterAll(async () => { await sql.end() })
beforeAll(async () => {
  await waitForDemoSite(sql)
  for (const role of ['admin', 'engineer', 'supervisor'] as const) cookies.set(role, await signInAs(role))
  const [tag] = await sql`select t.id, t.unit_id, t.site_id from tags t where t.code = 'TI-101'`
  tagId = tag!.id
  unitId = tag!.unit_id
  siteId = tag!.site_id
})

interface Case { role: Role, method: string, path: () => string, json?: unknown, field: string }
const NUL = 'a\u0000b'
const BIG_IDS = ['2147483648', '9223372036854775808', '1e20']
const validRule = () => ({
  targetKind: 'tag', tagId, name: 'Bad input probe', measure: 'value', comparison: 'above', threshold: 1,
  priority: 'low', alarmClass: 'alarm', consequence: 'c', likelyCause: 'c', operatorAction: 'c', timeToRespondS: 60,
})

// Every route with an :id in its path, with a body it would otherwise accept.
interface IdRoute { role: Role, method: string, route: string, json?: unknown }
const idRoutes: IdRoute[] = [
  { role: 'admin', method: 'PATCH', route: '/api/admin/users/:id', json: { name: 'New Name' } },
  { role: 'admin', method: 'POST', route: '/api/admin/users/:id/end-sessions' },
  { role: 'admin', method: 'POST', route: '/api/admin/users/:id/password-reset' },
  { role: 'admin', method: 'POST', route: '/api/admin/gateways/:id/revoke' },
  { role: 'admin', method: 'POST', route: '/api/admin/gateways/:id/rotate', json: {} },
  { role: 'admin', method: 'PATCH', route: '/api/admin/routes/:id', json: { enabled: false } },
  { role: 'admin', method: 'DELETE', route: '/api/admin/routes/:id' },
  { role: 'admin', method: 'GET', route: '/api/admin/routes/:id/deliveries' },
  { role: 'admin', method: 'POST', route: '/api/admin/routes/:id/test' },
  { role: 'supervisor', method: 'GET', route: '/api/alarms/:id' },
  { role: 'supervisor', method: 'POST', route: '/api/alarms/:id/shelve', json: { reason: 'probe test', minutes: 10 } },
  { role: 'supervisor', method: 'POST', route: '/api/alarms/:id/unshelve', json: {} },
  { role: 'engineer', method: 'POST', route: '/api/bump-tests/:id/fit' },
  { role: 'engineer', method: 'GET', route: '/api/rules/:id' },
  { role: 'engineer', method: 'PATCH', route: '/api/rules/:id', json: { enabled: false } },
  { role: 'engineer', method: 'PATCH', route: '/api/sites/:id', json: { name: 'Probe site' } },
  { role: 'engineer', method: 'POST', route: '/api/sites/:id/retire' },
  { role: 'engineer', method: 'POST', route: '/api/sites/:id/restore' },
  { role: 'engineer', method: 'PATCH', route: '/api/tags/:id', json: { description: 'Probe tag' } },
  { role: 'engineer', method: 'GET', route: '/api/tags/:id/bump-tests' },
  { role: 'engineer', method: 'POST', route: '/api/tags/:id/bump-tests', json: { stepTime: '2026-01-01 10:00:00', stepSize: 1, responseS: 60 } },
  { role: 'engineer', method: 'GET', route: '/api/tags/:id/indicator-settings' },
  { role: 'engineer', method: 'PUT', route: '/api/tags/:id/indicator-settings', json: { settings: {} } },
  { role: 'engineer', method: 'POST', route: '/api/tags/:id/indicator-settings/preview', json: { settings: {} } },
  { role: 'engineer', method: 'POST', route: '/api/tags/:id/retire' },
  { role: 'engineer', method: 'POST', route: '/api/tags/:id/restore' },
  { role: 'engineer', method: 'GET', route: '/api/tags/:id/series' },
  { role: 'engineer', method: 'PATCH', route: '/api/units/:id', json: { name: 'Probe unit' } },
  { role: 'engineer', method: 'POST', route: '/api/units/:id/retire' },
  { role: 'engineer', method: 'POST', route: '/api/units/:id/restore' },
  { role: 'engineer', method: 'GET', route: '/api/units/:id/slow-mode' },
  { role: 'supervisor', method: 'GET', route: '/api/incidents/:id' },
  { role: 'supervisor', method: 'GET', route: '/api/incidents/:id/timeline' },
  { role: 'supervisor', method: 'GET', route: '/api/incidents/:id/events.csv' },
  { role: 'supervisor', method: 'PATCH', route: '/api/incidents/:id', json: { cause: 'probe' } },
  { role: 'supervisor', method: 'POST', route: '/api/incidents/:id/state', json: { state: 'under_review' } },
  { role: 'supervisor', method: 'POST', route: '/api/incidents/:id/merge', json: { incidentId: 1 } },
  { role: 'supervisor', method: 'POST', route: '/api/incidents/:id/split', json: { alarmIds: [1] } },
  { role: 'supervisor', method: 'PUT', route: '/api/review/alert-outcomes/:id', json: { outcome: 'false' } },
]

// Ids carried in a query or a body, by field.
const idFields: ((big: string) => Case)[] = [
  big => ({ role: 'supervisor', method: 'GET', path: () => `/api/alarms?unitId=${big}`, field: 'unitId' }),
  big => ({ role: 'supervisor', method: 'POST', path: () => '/api/alarms/acknowledge', json: { ids: [Number(big)] }, field: 'ids.0' }),
  big => ({ role: 'engineer', method: 'GET', path: () => `/api/rules?tagId=${big}`, field: 'tagId' }),
  big => ({ role: 'engineer', method: 'POST', path: () => '/api/rules', json: { ...validRule(), tagId: Number(big) }, field: 'tagId' }),
  big => ({ role: 'engineer', method: 'POST', path: () => '/api/rules/preview', json: { rule: validRule(), ruleId: Number(big) }, field: 'ruleId' }),
  big => ({ role: 'supervisor', method: 'GET', path: () => `/api/shift-log?alarmId=${big}`, field: 'alarmId' }),
  big => ({ role: 'supervisor', method: 'POST', path: () => '/api/shift-log', json: { body: 'probe', tagId: Number(big) }, field: 'tagId' }),
  big => ({ role: 'admin', method: 'POST', path: () => '/api/admin/gateways', json: { siteId: Number(big), name: 'Probe box' }, field: 'siteId' }),
  big => ({ role: 'engineer', method: 'POST', path: () => '/api/units', json: { siteId: Number(big), code: 'PRB-1', name: 'Probe', kind: 'probe' }, field: 'siteId' }),
  big => ({
    role: 'engineer', method: 'POST', path: () => '/api/tags', field: 'loopTagId',
    json: { unitId, code: 'TI-9901', description: 'Probe', engineeringUnit: 'K', samplePeriodS: 1, rangeLow: 0, rangeHigh: 1, loopTagId: Number(big), loopRole: 'measurement' },
  }),
  big => ({ role: 'engineer', method: 'POST', path: () => `/api/uploads/preview?siteId=${big}`, field: 'siteId' }),
  big => ({ role: 'supervisor', method: 'GET', path: () => `/api/review/health?siteId=${big}`, field: 'siteId' }),
  big => ({ role: 'supervisor', method: 'GET', path: () => `/api/incidents?unitId=${big}`, field: 'unitId' }),
  big => ({ role: 'supervisor', method: 'POST', path: () => '/api/incidents', json: { unitId: Number(big), alarmIds: [1] }, field: 'unitId' }),
  big => ({ role: 'supervisor', method: 'POST', path: () => '/api/incidents/1/merge', json: { incidentId: Number(big) }, field: 'incidentId' }),
  big => ({ role: 'supervisor', method: 'POST', path: () => '/api/incidents/1/split', json: { alarmIds: [Number(big)] }, field: 'alarmIds.0' }),
  big => ({ role: 'supervisor', method: 'PUT', path: () => '/api/review/settings', json: { siteId: Number(big), incidentWindowS: 600 }, field: 'siteId' }),
  big => ({ role: 'engineer', method: 'POST', path: () => `/api/uploads/import?siteId=${big}&format=long&timeColumn=t&tagColumn=g&valueColumn=v`, field: 'siteId' }),
]

// A NUL in a text field, one per text field kind and route that takes text.
const nulCases: Case[] = [
  { role: 'supervisor', method: 'POST', path: () => '/api/shift-log', json: { body: NUL }, field: 'body' },
  { role: 'supervisor', method: 'POST', path: () => '/api/alarms/acknowledge', json: { ids: [1], comment: NUL }, field: 'comment' },
  { role: 'supervisor', method: 'POST', path: () => '/api/alarms/acknowledge', json: { ids: [1], requestId: `request-${NUL}` }, field: 'requestId' },
  { role: 'supervisor', method: 'POST', path: () => '/api/alarms/1/shelve', json: { reason: NUL, minutes: 10 }, field: 'reason' },
  { role: 'supervisor', method: 'POST', path: () => '/api/alarms/1/unshelve', json: { comment: NUL }, field: 'comment' },
  { role: 'engineer', method: 'POST', path: () => '/api/sites', json: { code: 'PRB', name: NUL, company: 'Probe Co', timeZone: 'Europe/London' }, field: 'name' },
  { role: 'engineer', method: 'PATCH', path: () => `/api/sites/${siteId}`, json: { company: NUL }, field: 'company' },
  { role: 'engineer', method: 'PATCH', path: () => `/api/sites/${siteId}`, json: { timeZone: `Europe/${NUL}` }, field: 'timeZone' },
  { role: 'engineer', method: 'POST', path: () => '/api/units', json: { siteId, code: 'PRB-1', name: 'Probe', kind: NUL }, field: 'kind' },
  { role: 'engineer', method: 'PATCH', path: () => `/api/units/${unitId}`, json: { description: NUL }, field: 'description' },
  { role: 'engineer', method: 'PATCH', path: () => `/api/tags/${tagId}`, json: { engineeringUnit: NUL }, field: 'engineeringUnit' },
  { role: 'engineer', method: 'PATCH', path: () => `/api/tags/${tagId}`, json: { code: `TI-1${NUL}` }, field: 'code' },
  { role: 'engineer', method: 'POST', path: () => '/api/rules', json: { ...validRule(), name: `Probe ${NUL}` }, field: 'name' },
  { role: 'engineer', method: 'PATCH', path: () => '/api/rules/1', json: { consequence: NUL }, field: 'consequence' },
  { role: 'engineer', method: 'POST', path: () => `/api/tags/${tagId}/bump-tests`, json: { stepTime: '2026-01-01 10:00:00', stepSize: 1, responseS: 60, note: NUL }, field: 'note' },
  { role: 'engineer', method: 'POST', path: () => `/api/tags/${tagId}/bump-tests`, json: { stepTime: `2026-01-01 10:00${NUL}`, stepSize: 1, responseS: 60 }, field: 'stepTime' },
  { role: 'engineer', method: 'PUT', path: () => `/api/tags/${tagId}/indicator-settings`, json: { settings: {}, reason: NUL }, field: 'reason' },
  { role: 'engineer', method: 'POST', path: () => `/api/uploads/import?siteId=${siteId}&format=long&timeColumn=${encodeURIComponent(NUL)}&tagColumn=g&valueColumn=v`, field: 'timeColumn' },
  { role: 'admin', method: 'POST', path: () => '/api/admin/gateways', json: { siteId, name: NUL }, field: 'name' },
  { role: 'supervisor', method: 'PATCH', path: () => '/api/incidents/1', json: { cause: NUL }, field: 'cause' },
  { role: 'supervisor', method: 'POST', path: () => '/api/incidents', json: { unitId, alarmIds: [1], title: `Probe ${NUL}` }, field: 'title' },
  { role: 'supervisor', method: 'PUT', path: () => '/api/review/alert-outcomes/1', json: { outcome: 'false', note: NUL }, field: 'note' },
  { role: 'admin', method: 'POST', path: () => '/api/admin/users', json: { email: 'probe@example.com', name: `Pro${NUL}`, role: 'operator' }, field: 'name' },
  { role: 'admin', method: 'POST', path: () => '/api/admin/users', json: { email: `pro${NUL}be@example.com`, name: 'Probe', role: 'operator' }, field: 'email' },
  { role: 'admin', method: 'PATCH', path: () => '/api/admin/users/1', json: { name: `Pro${NUL}` }, field: 'name' },
  { role: 'admin', method: 'POST', path: () => '/api/session/password', json: { currentPassword: NUL, newPassword: 'a long enough new pass phrase' }, field: 'currentPassword' },
]
const publicNulCases: Omit<Case, 'role'>[] = [
  { method: 'POST', path: () => '/api/public/sign-in', json: { email: `adm${NUL}in@harrowgate.example`, password: 'x' }, field: 'email' },
  { method: 'POST', path: () => '/api/public/sign-in', json: { email: 'admin@harrowgate.example', password: NUL }, field: 'password' },
  { method: 'POST', path: () => '/api/public/set-password', json: { token: 'A'.repeat(43), password: `a long enough pass phrase${NUL}` }, field: 'password' },
]

// Years past 9999: JavaScript reads them, PostgreSQL cannot read their ISO text back.
const timeCases: Case[] = [
  { role: 'supervisor', method: 'GET', path: () => '/api/alarms?view=history&from=10000-01-01', field: 'from' },
  { role: 'supervisor', method: 'GET', path: () => '/api/alarms?view=history&to=%2B010000-01-01T00:00:00Z', field: 'to' },
  { role: 'supervisor', method: 'POST', path: () => '/api/shift-log', json: { body: 'probe', at: '10000-01-01T00:00:00Z' }, field: 'at' },
  { role: 'supervisor', method: 'GET', path: () => '/api/review/health?from=10000-01-01&to=10000-01-02', field: 'from' },
]

const cases: Case[] = [
  ...idRoutes.flatMap(({ route, ...r }) => BIG_IDS.map(big => ({ ...r, path: () => route.replace(':id', big), field: 'id' }))),
  ...idFields.flatMap(make => BIG_IDS.map(make)),
  ...nulCases,
  ...timeCases,
]

async function send(c: Omit<Case, 'role'>, cookie?: string) {
  return call(c.path(), { method: c.method, cookie, ...(c.json !== undefined ? { json: c.json } : {}) })
}

describe('bad inputs answer 4xx naming the field, never 500', () => {
  it.each(cases.map(c => [`${c.method} ${c.path().slice(0, 90)} (${c.field})`, c] as const))('%s', async (_name, c) => {
    const res = await send(c, cookies.get(c.role))
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.message).toContain(`${c.field}:`)
  })

  it.each(publicNulCases.map(c => [`${c.method} ${c.path()} (${c.field})`, c] as const))('%s', async (_name, c) => {
    const res = await send(c)
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.message).toContain(`${c.field}:`)
  })

  it('stored nothing for any of them', async () => {
    const [row] = await sql`select
      (select count(*)::int from shift_log_notes where body = 'probe' or body like 'a%b') as notes,
      (select count(*)::int from sites where code = 'PRB') as sites,
      (select count(*)::int from units where code = 'PRB-1') as units,
      (select count(*)::int from tags where code = 'TI-9901') as tags,
      (select count(*)::int from alarm_rules where name like 'Probe%' or name = 'Bad input probe') as rules,
      (select count(*)::int from gateways where name like 'Probe%') as gateways,
      (select count(*)::int from users where email like 'pro%') as users`
    expect(row).toEqual({ notes: 0, sites: 0, units: 0, tags: 0, rules: 0, gateways: 0, users: 0 })
  })
})

describe('a sample tag holding NUL is refused on its own', () => {
  it('rejects that sample naming the tag field and stores the good one beside it', async () => {
    const { key } = await createTestGateway('NUL probe box')
    const time = new Date(Date.now() - 60_000).toISOString()
    const res = await ingest(key, { samples: [{ tag: `TI-101${'\u0000'}`, time, value: 1 }, { tag: 'TI-101', time, value: 400 }] })
    expect(res.status).toBe(200)
    expect(res.body.rejected).toEqual([expect.objectContaining({ index: 0, field: 'tag' })])
    expect(res.body.accepted).toBe(1)
  })
})

describe('UTF-16 CSV files: read when marked little-endian, refused otherwise — never read as garbage', () => {
  // "Unicode text" as spreadsheet programs save it is UTF-16LE with the byte-order mark FF FE; the
  // big-endian form starts FE FF (Unicode Standard §23.8, "Byte Order Mark" [from memory]).
  const text = '\uFEFFtime,TI-101\n2026-01-01 00:00:00,401.5\n'
  const littleEndian = () => Buffer.from(text, 'utf16le')
  const bigEndian = () => Buffer.from(text, 'utf16le').swap16()
  const post = (path: string, body: Buffer) => call(path, { method: 'POST', cookie: cookies.get('engineer'), headers: { 'content-type': 'text/csv' }, body })
  const importPath = () => `/api/uploads/import?siteId=${siteId}&format=wide&timeColumn=time&timeZone=UTC`
  const stored = async () => (await sql`select value from samples s join tags t on t.id = s.tag_id
    where t.code = 'TI-101' and s.time = '2026-01-01 00:00:00+00'`).map(r => r.value)

  it('preview: a big-endian file is 415 naming the body', async () => {
    const res = await post(`/api/uploads/preview?siteId=${siteId}&complete=1`, bigEndian())
    expect(res.status).toBe(415)
    expect(res.body.message).toMatch(/^body: .*UTF-8/)
  })

  it('import: a big-endian file is 415 naming the body, nothing stored', async () => {
    const res = await post(importPath(), bigEndian())
    expect(res.status).toBe(415)
    expect(res.body.message).toMatch(/^body: .*UTF-8/)
    expect(await stored()).toEqual([])
  })

  it('preview and import read a little-endian file with its mark as its text says', async () => {
    const preview = await post(`/api/uploads/preview?siteId=${siteId}&complete=1`, littleEndian())
    expect(preview.status).toBe(200)
    expect(preview.body).toMatchObject({ header: ['time', 'TI-101'], rows: [['2026-01-01 00:00:00', '401.5']] })
    const res = await post(importPath(), littleEndian())
    expect(res.status).toBe(200)
    expect(await stored()).toEqual([401.5])
  })
})
