import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import type { Role } from '../../shared/utils/roles'
import { BAD_INPUT_KINDS, type BadInputKind, type Fixtures } from './badInputKinds.table'

// Each kind of bad input (badInputKinds.table.ts, sources there) answers its 4xx naming the field,
// and leaves every table exactly as it was: same rows, same contents. Scheduled ticks are off so
// nothing else writes while a case runs.

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
const cookies = new Map<Role, string>()
let fixtures: Fixtures
afterAll(async () => { await sql.end() })

/** Tables too big to hash on every case are compared by row count and newest row version. */
const HASH_ROWS_UP_TO = 20_000
let tables: { name: string, hashed: boolean }[] = []

beforeAll(async () => {
  await waitForDemoSite(sql)
  for (const role of ['operator', 'engineer', 'supervisor', 'admin'] as const) cookies.set(role, await signInAs(role))
  const [row] = await sql`select
    (select id from sites order by id limit 1) as site_id,
    (select id from units order by id limit 1) as unit_id,
    (select id from tags order by id limit 1) as tag_id,
    (select id from alarm_rules order by id limit 1) as rule_id,
    (select id from gateways order by id limit 1) as gateway_id,
    (select id from users where role = 'operator' order by id limit 1) as user_id`
  let [routeRow] = await sql`select id from notification_routes order by id limit 1`
  if (!routeRow) {
    const made = await call('/api/admin/routes', { method: 'POST', cookie: cookies.get('admin'), json: {
      name: 'Fixture route', siteId: row!.site_id, email: 'fixture@example.com', minPriority: 'high', alarmClasses: ['alarm'],
    } })
    routeRow = made.body
  }
  fixtures = {
    siteId: row!.site_id, unitId: row!.unit_id, tagId: row!.tag_id, ruleId: row!.rule_id,
    gatewayId: row!.gateway_id, userId: row!.user_id, routeId: routeRow!.id,
  }
  const names = await sql<{ name: string }[]>`
    select c.relname as name from pg_class c join pg_namespace n on n.oid = c.relnamespace
    where n.nspname = 'public' and c.relkind in ('r', 'p') and not c.relispartition order by c.relname`
  const counts = await sql.unsafe<{ name: string, rows: number }[]>(
    names.map(t => `select '${t.name}' as name, count(*)::int as rows from "${t.name}"`).join(' union all '))
  tables = counts.map(t => ({ name: t.name, hashed: t.rows <= HASH_ROWS_UP_TO }))
})

/** Per table: its row count and a digest of every row (or, for the big ones, the newest row version). */
async function storedState(): Promise<Record<string, string>> {
  const parts = tables.map(t => (t.hashed
    ? `select '${t.name}' as name, count(*)::text || ':' || coalesce(md5(string_agg(x::text, '|' order by x::text)), '') as state from "${t.name}" x`
    : `select '${t.name}' as name, count(*)::text || ':' || coalesce(max(xmin::text::bigint), 0)::text as state from "${t.name}"`))
  const rows = await sql.unsafe<{ name: string, state: string }[]>(parts.join(' union all '))
  return Object.fromEntries(rows.map(r => [r.name, r.state]))
}

async function send(c: BadInputKind) {
  const headers: Record<string, string> = {}
  let cookie: string | undefined
  if (c.as === 'gateway') headers.authorization = `Bearer ${process.env.BRINKLINE_SIM_KEY}`
  else if (c.as !== 'anonymous') cookie = cookies.get(c.as)
  if (c.raw) headers['content-type'] = c.raw.type
  return call(c.path(fixtures), {
    method: c.method, cookie, headers,
    ...(c.json ? { json: c.json(fixtures) } : c.raw ? { body: c.raw.body } : {}),
  })
}

describe('kinds of bad input: the 4xx named, the field named, nothing stored', () => {
  it('covers at least 60 kinds, each once', () => {
    expect(BAD_INPUT_KINDS.length).toBeGreaterThanOrEqual(60)
    expect(new Set(BAD_INPUT_KINDS.map(c => c.kind)).size).toBe(BAD_INPUT_KINDS.length)
  })

  it.each(BAD_INPUT_KINDS.map(c => [c.kind, c] as const))('%s', async (_kind, c) => {
    const before = await storedState()
    const res = await send(c)
    const message = String(res.body?.message ?? res.body)
    expect(res.status, message).toBe(c.status)
    expect(message).toMatch(new RegExp(`(^|[—;] ?)${c.field.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}:`))
    if (c.mentions) expect(message).toContain(c.mentions)
    const after = await storedState()
    const counted = new Set(c.countedIn ?? [])
    for (const table of counted) expect(after[table], `${table} counts the refusal`).not.toEqual(before[table])
    const untouched = (state: Record<string, string>) => Object.entries(state).filter(([table]) => !counted.has(table))
    expect(untouched(after)).toEqual(untouched(before))
  })
})
