import postgres from 'postgres'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// Issue 13 item 8: the server connects as a role that owns no tables; the audit log and the alarm
// events take only INSERT and SELECT from it; migrations run as the schema owner. Privilege
// failures are SQLSTATE 42501 insufficient_privilege (PostgreSQL 15 manual, Appendix A); only a
// table's owner may ALTER or DROP it, or disable its triggers (manual, ALTER TABLE).
await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
const appUrl = process.env.BRINKLINE_APP_DATABASE_URL
if (!appUrl) throw new Error('BRINKLINE_APP_DATABASE_URL is not set: run the suite through `npm test` (scripts/pg.sh makes the roles)')
const app = postgres(appUrl, { max: 1, onnotice: () => {} })
afterAll(async () => { await app.end(); await sql.end() })
beforeAll(() => waitForDemoSite(sql))

const refused = (query: Promise<unknown>) => expect(query).rejects.toMatchObject({ code: '42501' })

describe('database roles', () => {
  it('the server serves as brinkline_app, and every table belongs to brinkline_owner', async () => {
    await call('/api/public/health')
    const users = await sql`select distinct usename from pg_stat_activity where datname = current_database() and pid <> pg_backend_pid() and usename is not null`
    expect(users.map(u => u.usename)).toContain('brinkline_app')
    const owners = await sql`select distinct tableowner from pg_tables where schemaname = 'public'`
    expect(owners.map(o => o.tableowner)).toEqual(['brinkline_owner'])
    const [migrations] = await sql`select tableowner from pg_tables where schemaname = 'drizzle' and tablename = '__drizzle_migrations'`
    expect(migrations!.tableowner).toBe('brinkline_owner')
  })

  it('as the app role, UPDATE, DELETE and TRUNCATE on audit_log and alarm_events fail, and so do ALTER, DROP and switching triggers off', async () => {
    await signInAs('admin')
    const [first] = await app`select id, action from audit_log order by id limit 1`
    expect(first).toBeDefined()
    await refused(app`update audit_log set action = 'rewritten' where id = ${first!.id}`)
    await refused(app`delete from audit_log where id = ${first!.id}`)
    await refused(app`truncate audit_log`)
    await refused(app`update alarm_events set id = id`)
    await refused(app`delete from alarm_events`)
    await refused(app`alter table audit_log disable trigger all`)
    await refused(app`alter table alarm_events disable trigger alarm_events_append_only`)
    await refused(app`drop table audit_log`)
    await refused(app`create table brinkline_rogue (id int)`)
    const [after] = await sql`select action from audit_log where id = ${first!.id}`
    expect(after!.action).toBe(first!.action)
  })

  it('as the app role, the audit log and the alarm events can still be read and appended to', async () => {
    const [row] = await app`insert into audit_log (user_id, action, target, detail, address) values (null, 'test.append', 'dbRoles', '{}', '') returning id`
    expect(Number(row!.id)).toBeGreaterThan(0)
    const read = await app`select action from audit_log where id = ${row!.id}`
    expect(read[0]!.action).toBe('test.append')
    await app`select count(*) from alarm_events`
  })

  it('the app still does its work: sign-in audited, a change audited, ingest into a new day partition, the storage job', async () => {
    const admin = await signInAs('admin')
    const [site] = await sql`select id from sites order by id limit 1`
    const set = await call(`/api/admin/storage/sites/${site!.id}`, { method: 'PATCH', cookie: admin, json: { rawRetentionDays: 400 } })
    expect(set.status).toBe(200)
    const [audited] = await sql`select action from audit_log order by id desc limit 1`
    expect(audited!.action).toBe('site.retention')
    // A day with no partition yet: the app role asks brinkline_ensure_partition (security definer) for it.
    const res = await call('/api/ingest', {
      method: 'POST', headers: { authorization: `Bearer ${process.env.BRINKLINE_SIM_KEY}` },
      json: { samples: [{ tag: 'TI-401', time: new Date(Date.now() - 300 * 86_400_000).toISOString(), value: 45 }] },
    })
    expect(res.status).toBe(200)
    expect(res.body.accepted).toBe(1)
    const [stored] = await sql`select s.tableoid::regclass::text as part from samples s join tags t on t.id = s.tag_id where t.code = 'TI-401' order by time limit 1`
    expect(stored!.part).toMatch(/^samples_p\d{8}$/)
    const report = await runServerTask('storage:maintain')
    expect(report.databaseBytes).toBeGreaterThan(0)
    expect((await call('/api/admin/storage', { cookie: admin })).status).toBe(200)
    await runServerTask('indicators:refresh')
  })
})
