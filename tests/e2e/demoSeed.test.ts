import { afterAll, describe, expect, it } from 'vitest'
import { startServer, stopServer } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { testSql } from '../support/db'
import { ingest } from '../support/gateway'
import { call, signInAs } from '../support/session'
import { DEMO_OPCUA_CONNECTION } from '../../shared/demo/opcuaDemo'

// The demo seed runs at every start (server/services/demo/demoSeed.ts). A restart must not undo
// an admin's decision, and the seeded accounts must not give away that they share a password.
const SIMULATOR_KEY = `sim-${'k'.repeat(40)}`
// The start command's port of the simulators' OPC UA server (nothing listens there: the collector is off in tests).
const OPCUA_PORT = 48000 + Math.floor(Math.random() * 1000)
await setupBuiltServer({ BRINKLINE_SIM_KEY: SIMULATOR_KEY, BRINKLINE_DEMO_OPCUA_PORT: String(OPCUA_PORT) },
  { port: 39000 + Math.floor(Math.random() * 1000) })
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

  it('connects to the simulators\' OPC UA server for the feed tank\'s tags, and a restart keeps an admin\'s changes', async () => {
    const connectionOf = async () => sql`
      select c.id, c.endpoint_url, c.enabled, c.sampling_interval_ms, array_agg(m.node_id || ' ' || t.code order by t.code) as nodes
      from opcua_connections c join opcua_mappings m on m.connection_id = c.id join tags t on t.id = m.tag_id
      where c.name = ${DEMO_OPCUA_CONNECTION} group by c.id`
    const [seeded] = await connectionOf()
    expect(seeded!.endpoint_url).toBe(`opc.tcp://127.0.0.1:${OPCUA_PORT}/brinkline-plant`)
    // The steady T-400 unit's tags (shared/demo/catalogue.ts), under the plant server's node ids.
    expect(seeded!.nodes).toEqual(['ns=1;s=LI-402 LI-402', 'ns=1;s=TI-401 TI-401'])
    expect(seeded!.sampling_interval_ms).toBe(0)
    const admin = await signInAs('admin')
    expect((await call(`/api/admin/opcua/${seeded!.id}`, { method: 'PATCH', cookie: admin, json: { enabled: false } })).status).toBe(200)
    await stopServer()
    await startServer()
    const after = await connectionOf()
    expect(after).toHaveLength(1)
    expect([after[0]!.id, after[0]!.enabled]).toEqual([seeded!.id, false])
  })
})
