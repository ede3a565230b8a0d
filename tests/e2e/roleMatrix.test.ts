import { readdirSync } from 'node:fs'
import { join, relative } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { waitForDemoSite } from '../support/pipeline'
import { activation, insertOccurrence, insertRule, oneShot } from '../support/reviewFixtures'
import { ROOT, setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import type { Role } from '../../shared/utils/roles'
import { CALLERS, MODULE_ROUTES, ROLE_MATRIX, type Caller, type Fixture, type MatrixEntry } from './roleMatrix.table'

// The role matrix (issue 16 item 5): every route file under server/api, called by every kind of
// caller against the built server, must answer as docs/design.md §D2.1/§D6 say (the table in
// roleMatrix.table.ts). Refusals are checked first, on untouched rows, then the allowed calls.

// The test-only task route exists only with this switch; without it its row would be a 404.
await setupBuiltServer({ BRINKLINE_TEST_ROUTES: '1' })
const sql = testSql()
afterAll(async () => { await sql.end() })

const METHODS = ['get', 'post', 'put', 'patch', 'delete'] as const
const API_DIR = join(ROOT, 'server/api')

/** 'server/api/admin/opcua/[id]/index.patch.ts' → 'PATCH /api/admin/opcua/:id' (docs/style.md §C2: the method in the name). */
function routeOfFile(file: string): string {
  const parts = relative(API_DIR, file).replace(/\.ts$/, '').split('/')
  const last = parts.pop()!
  const method = last.slice(last.lastIndexOf('.') + 1)
  if (!(METHODS as readonly string[]).includes(method)) throw new Error(`${file}: no HTTP method in the file name`)
  const name = last.slice(0, last.lastIndexOf('.'))
  const segments = [...parts, ...(name === 'index' ? [] : [name])].map(s => s.replace(/^\[(\w+)\]$/, ':$1'))
  return `${method.toUpperCase()} /api${segments.length ? `/${segments.join('/')}` : ''}`
}

function routeFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap(entry =>
    entry.isDirectory() ? routeFiles(join(dir, entry.name)) : entry.name.endsWith('.ts') ? [join(dir, entry.name)] : [])
}

const discovered = [...routeFiles(API_DIR).map(routeOfFile), ...MODULE_ROUTES].sort()
const ROLES: Role[] = ['operator', 'engineer', 'supervisor', 'admin']
const cookies = new Map<Role, string>()
const ids = {} as Record<Fixture, number>
let gatewayKey = ''

/** Makes every row a `:id` in the table points at, through the API where one exists. */
async function makeFixtures() {
  const as = (role: Role) => cookies.get(role)!
  const created = async (role: Role, path: string, json: unknown) => {
    const res = await call(path, { method: 'POST', cookie: as(role), json })
    if (res.status !== 201) throw new Error(`fixture ${path} answered ${res.status}: ${JSON.stringify(res.body)}`)
    return Number(res.body.id)
  }
  const [tag] = await sql`select t.id, t.unit_id, t.site_id from tags t where t.code = 'TI-401'`
  ids.tag = tag!.id
  ids.unit = tag!.unit_id
  ids.site = tag!.site_id
  const siteId = ids.site
  ids.rule = Number((await sql`select id from alarm_rules order by id limit 1`)[0]!.id)

  ids.spareSite = await created('engineer', '/api/sites', { code: 'MTX', name: 'Matrix spare site', company: 'Matrix Co', timeZone: 'Europe/London' })
  ids.spareUnit = await created('engineer', '/api/units', { siteId, code: 'MTX-1', name: 'Matrix spare unit', kind: 'spare' })
  ids.spareTag = await created('engineer', '/api/tags', {
    unitId: ids.spareUnit, code: 'TI-9801', description: 'Matrix spare tag', engineeringUnit: 'K', samplePeriodS: 1, rangeLow: 0, rangeHigh: 1,
  })
  ids.bumpTest = await created('engineer', `/api/tags/${ids.tag}/bump-tests`, { stepTime: '2026-01-01 10:00:00', stepSize: 1, responseS: 60 })
  ids.replay = await created('engineer', '/api/replays', { tagId: ids.tag, from: '2026-01-01T00:00:00Z', to: '2026-01-01T06:00:00Z' })

  const startedAt = Date.now() - 3_600_000
  ids.alarm = await insertOccurrence(sql, await insertRule(sql, { unitCode: 'T-400', tagCode: 'TI-401' }), [activation(startedAt)], null)
  ids.alert = await oneShot(sql, await insertRule(sql, { unitCode: 'T-400', alarmClass: 'alert', measure: 'early_warning' }), startedAt)
  ids.incident = await created('supervisor', '/api/incidents', { unitId: ids.unit, alarmIds: [ids.alarm], title: 'Matrix incident' })

  ids.spareUser = await created('admin', '/api/admin/users', { email: 'matrix.spare@harrowgate.example', name: 'Matrix Spare', role: 'operator' })
  const gateway = async (name: string) => {
    const res = await call('/api/admin/gateways', { method: 'POST', cookie: as('admin'), json: { siteId, name } })
    if (res.status !== 201) throw new Error(`fixture gateway answered ${res.status}: ${JSON.stringify(res.body)}`)
    return res.body as { id: number, key: string }
  }
  gatewayKey = (await gateway('Matrix caller box')).key
  ids.gatewayToRevoke = (await gateway('Matrix box to revoke')).id
  ids.gatewayToRotate = (await gateway('Matrix box to rotate')).id
  const opcua = (name: string) => created('admin', '/api/admin/opcua', {
    siteId, name, endpointUrl: 'opc.tcp://127.0.0.1:48499/matrix', securityMode: 'None', securityPolicy: 'None', samplingIntervalMs: 500, publishingIntervalMs: 1000,
  })
  ids.opcuaConnection = await opcua('Matrix server')
  ids.opcuaToDelete = await opcua('Matrix server to delete')
  const route = (name: string) => created('admin', '/api/admin/routes', { siteId, name, email: 'matrix@harrowgate.example', minPriority: 'high', alarmClasses: ['alarm'] })
  ids.route = await route('Matrix route')
  ids.routeToDelete = await route('Matrix route to delete')
}

beforeAll(async () => {
  await waitForDemoSite(sql)
  for (const role of ROLES) cookies.set(role, await signInAs(role))
  await makeFixtures()
})

function pathOf(route: string, entry: MatrixEntry): string {
  const path = route.slice(route.indexOf(' ') + 1)
  if (!path.includes(':')) return path
  if (!entry.id) throw new Error(`${route}: the table names no row for its path parameter`)
  const id = ids[entry.id]
  if (!Number.isInteger(id)) throw new Error(`${route}: fixture ${entry.id} was not made`)
  return path.replace(/:id\b/, String(id))
}

/** One call as `caller`; writes send `{}` (or a one-line CSV), enough to pass or fail validation after the guard. */
async function callAs(caller: Caller, route: string, entry: MatrixEntry) {
  const method = route.slice(0, route.indexOf(' '))
  const headers: Record<string, string> = {}
  let body: string | undefined
  if (method !== 'GET' && method !== 'DELETE') {
    headers['content-type'] = entry.body === 'csv' ? 'text/csv' : 'application/json'
    body = entry.body === 'csv' ? 'time,tag,value\n' : '{}'
  }
  if (caller === 'gateway') headers.authorization = `Bearer ${gatewayKey}`
  let cookie: string | undefined
  if (caller !== 'anonymous' && caller !== 'gateway') cookie = entry.endsSession ? await signInAs(caller) : cookies.get(caller)
  return call(pathOf(route, entry), { method, headers, body, cookie })
}

// A 403 from the role guards (server/utils/auth.ts) names the role; the cross-site guard's 403
// names a header instead and must not pass for a role check.
const ROLE_REFUSAL = /^(This needs the .+ role; you are signed in as|Your role \(.+\) may not )/

type Check = { route: string, entry: MatrixEntry, caller: Caller }
const checks = (want: (outcome: string) => boolean): Check[] =>
  discovered.filter(r => ROLE_MATRIX[r]).flatMap(route => CALLERS
    .filter(caller => want(String(ROLE_MATRIX[route]!.expect[caller])))
    .map(caller => ({ route, entry: ROLE_MATRIX[route]!, caller })))

describe('role matrix: every route × every caller', () => {
  it('has one row for every route file under server/api (and each module route), and no row without one', () => {
    expect(discovered.length).toBeGreaterThan(0)
    const rows = Object.keys(ROLE_MATRIX).sort()
    expect(discovered.filter(r => !ROLE_MATRIX[r]), 'routes with no row in roleMatrix.table.ts').toEqual([])
    expect(rows.filter(r => !discovered.includes(r)), 'rows with no route file').toEqual([])
  })

  it('refuses each caller the table refuses: 401 without a session or key, 403 naming the role', async () => {
    const wrong: string[] = []
    for (const { route, entry, caller } of checks(o => o !== 'allowed')) {
      const want = entry.expect[caller] as number
      const res = await callAs(caller, route, entry)
      const message = String(res.body?.message ?? '')
      if (res.status !== want) wrong.push(`${route} as ${caller}: want ${want}, got ${res.status} ${message}`)
      else if (want === 403 && !ROLE_REFUSAL.test(message)) wrong.push(`${route} as ${caller}: 403 but not a role refusal: ${message}`)
    }
    expect(wrong).toEqual([])
  })

  it('lets each caller the table allows past the guard, on a row that exists', async () => {
    const wrong: string[] = []
    for (const { route, entry, caller } of checks(o => o === 'allowed')) {
      const res = await callAs(caller, route, entry)
      // 404/405 would mean the call never reached the guard's row, 415 that the body check in
      // front of the route refused it (server/middleware/sameOriginWrites.ts); 5xx is a defect in its own right.
      if ([401, 403, 404, 405, 415].includes(res.status) || res.status >= 500)
        wrong.push(`${route} as ${caller}: got ${res.status} ${String(res.body?.message ?? '').slice(0, 160)}`)
    }
    expect(wrong).toEqual([])
  })
})
