import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, demoEmail, signInAs } from '../support/session'

await setupBuiltServer()
const sql = testSql()
afterAll(async () => { await sql.end() })

let admin = ''
let adminId = 0
const started = new Date(Date.now() - 1000).toISOString()
beforeAll(async () => {
  await waitForDemoSite(sql)
  admin = await signInAs('admin')
  adminId = (await sql`select id from users where email = ${demoEmail('admin')}`)[0]!.id
  await signInAs('operator')
  const [op] = await sql`select id from users where email = ${demoEmail('operator')}`
  await call(`/api/admin/users/${op!.id}`, { method: 'PATCH', cookie: admin, json: { name: 'Olu M. Mensah' } })
})

describe('audit log', () => {
  // As the superuser, who holds every privilege, so the trigger is what refuses; the app role is
  // refused before that by its grants (tests/e2e/dbRoles.test.ts).
  it('refuses UPDATE, DELETE and TRUNCATE even to the superuser (trigger, migration 0011)', async () => {
    const [{ current_user: who }] = await sql`select current_user`
    const url = new URL(process.env.NUXT_DATABASE_URL!)
    expect(who).toBe(decodeURIComponent(url.username))
    const [first] = await sql`select id, action from audit_log order by id limit 1`
    await expect(sql`update audit_log set action = 'rewritten' where id = ${first!.id}`).rejects.toThrow(/append-only \(UPDATE refused\)/)
    await expect(sql`delete from audit_log where id = ${first!.id}`).rejects.toThrow(/append-only \(DELETE refused\)/)
    await expect(sql`truncate audit_log`).rejects.toThrow(/append-only \(TRUNCATE refused\)/)
    const [after] = await sql`select action from audit_log where id = ${first!.id}`
    expect(after!.action).toBe(first!.action)
  })

  it('filters by who, what and period', async () => {
    const mine = await call(`/api/admin/audit?userId=${adminId}&action=user.&from=${encodeURIComponent(started)}`, { cookie: admin })
    expect(mine.status).toBe(200)
    expect(mine.body.length).toBeGreaterThan(0)
    for (const e of mine.body) {
      expect(e.userId).toBe(adminId)
      expect(e.action.startsWith('user.')).toBe(true)
      expect(Date.parse(e.at)).toBeGreaterThanOrEqual(Date.parse(started))
    }
    const update = mine.body.find((e: { action: string }) => e.action === 'user.update')
    expect(update.detail.before.name).toBe('Olu Mensah')
    expect(update.detail.after.name).toBe('Olu M. Mensah')
    expect(update.userEmail).toBe(demoEmail('admin'))
    const none = await call(`/api/admin/audit?to=${encodeURIComponent('2001-01-01T00:00:00Z')}`, { cookie: admin })
    expect(none.body).toEqual([])
    const signIns = await call('/api/admin/audit?action=sign-in', { cookie: admin })
    expect(new Set(signIns.body.map((e: { action: string }) => e.action))).toEqual(new Set(['sign-in']))
  })

  it('exports the filtered records as CSV and records the export', async () => {
    const res = await call(`/api/admin/audit/export?action=user.update&from=${encodeURIComponent(started)}`, { cookie: admin })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="brinkline-audit-/)
    const lines = (res.body as string).split('\r\n').filter(Boolean)
    expect(lines[0]).toBe('id,time_utc,user,action,target,address,detail')
    expect(lines.length).toBe(2)
    expect(lines[1]).toContain(`,${demoEmail('admin')},user.update,${demoEmail('operator')},`)
    expect(lines[1]).toContain('""Olu M. Mensah""')
    const [exp] = await sql`select detail from audit_log where action = 'audit.export' order by id desc limit 1`
    expect(exp!.detail.rows).toBe(1)
  })

  it('names the bad filter field and keeps the log from operators', async () => {
    const zoneless = await call('/api/admin/audit?from=2026-03-02T12:00:00', { cookie: admin })
    expect(zoneless.status).toBe(400)
    expect(zoneless.body.message).toContain('from: must be an ISO 8601 time with Z or an offset')
    const reversed = await call('/api/admin/audit?from=2026-03-02T12:00:00Z&to=2026-03-01T12:00:00Z', { cookie: admin })
    expect(reversed.body.message).toContain('to: must be after from')
    expect((await call('/api/admin/audit/export?userId=2147483648', { cookie: admin })).status).toBe(400)
    expect((await call('/api/admin/audit', { cookie: await signInAs('operator') })).status).toBe(403)
    expect((await call('/api/admin/audit/export')).status).toBe(401)
  })

  it('records a refused action (403) with who, which route and from where, and the admin can filter for it', async () => {
    const operator = await signInAs('operator')
    const [op] = await sql`select id from users where email = ${demoEmail('operator')}`
    const refused = await call('/api/admin/users', { cookie: operator })
    expect(refused.status).toBe(403)
    const mine = await call(`/api/admin/audit?userId=${op!.id}&action=access.refused&from=${encodeURIComponent(started)}`, { cookie: admin })
    expect(mine.status).toBe(200)
    const row = mine.body.find((e: { target: string }) => e.target === 'GET /api/admin/users')
    expect(row, JSON.stringify(mine.body)).toBeTruthy()
    expect(row.detail).toMatchObject({ role: 'operator' })
    expect(row.address).toBeTruthy()
  })
})
