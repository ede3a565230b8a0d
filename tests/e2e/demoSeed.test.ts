import { afterAll, describe, expect, it } from 'vitest'
import { startServer, stopServer } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { testSql } from '../support/db'
import { ingest } from '../support/gateway'
import { call, signInAs } from '../support/session'

// The demo seed runs at every start (server/services/demo/demoSeed.ts). A restart must not undo
// an admin's decision, and the seeded accounts must not give away that they share a password.
const SIMULATOR_KEY = `sim-${'k'.repeat(40)}`
await setupBuiltServer({ BRINKLINE_SIM_KEY: SIMULATOR_KEY }, { port: 39000 + Math.floor(Math.random() * 1000) })
const sql = testSql()
afterAll(() => sql.end())

const sample = { samples: [{ tag: 'TI-401', time: new Date(Date.UTC(2026, 5, 1)).toISOString(), value: 40, quality: 'good' }] }

describe('the demo seed at every start', () => {
  it('salts each demo user\'s password on its own: four users, four different hashes (NIST SP 800-63B §5.1.1.2 asks for a per-user salt)', async () => {
    const rows = await sql`select password_hash from users where email like '%@harrowgate.example'`
    expect(rows).toHaveLength(4)
    expect(new Set(rows.map(r => r.password_hash)).size).toBe(4)
  })

  it('keeps a simulator gateway an admin revoked revoked after a restart', async () => {
    expect((await ingest(SIMULATOR_KEY, sample)).status).toBe(200)
    const admin = await signInAs('admin')
    const [gateway] = await sql`select id from gateways where name = 'Demo plant simulators'`
    expect((await call(`/api/admin/gateways/${gateway!.id}/revoke`, { method: 'POST', cookie: admin })).status).toBe(200)
    expect((await ingest(SIMULATOR_KEY, sample)).status).toBe(401)
    await stopServer()
    await startServer()
    expect((await ingest(SIMULATOR_KEY, sample)).status).toBe(401)
    const [after] = await sql`select revoked_at from gateways where id = ${gateway!.id}`
    expect(after!.revoked_at).not.toBeNull()
    const audits = await sql`select action from audit_log where target = 'Demo plant simulators' order by id`
    expect(audits.map(a => a.action)).toEqual(['gateway.revoke'])
  })
})
