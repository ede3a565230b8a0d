import { randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { launchChromium, screenshot, signInThroughForm } from '../support/browser'
import { testSql } from '../support/db'
import { waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// Issue 17 item 1, first slice: the admin screen's routes for OPC UA connections and their
// node-to-tag tables. The collector is switched off: these endpoints are loopback ports nobody
// listens on, and nothing here depends on a collector's state.
const SECRET = randomBytes(32).toString('hex')
await setupBuiltServer({ BRINKLINE_OPCUA_SECRET_KEY: SECRET, BRINKLINE_OPCUA_COLLECTOR: '0' })
const sql = testSql()
afterAll(async () => { await sql.end() })
let admin = ''
let siteId = 0
beforeAll(async () => {
  await waitForDemoSite(sql)
  admin = await signInAs('admin')
  siteId = (await sql`select id from sites order by id limit 1`)[0]!.id
})

const PASSWORD = 'plant-reader-Secret-42'
const connection = (name: string) => ({
  siteId, name, endpointUrl: 'opc.tcp://127.0.0.1:48410/brinkline', securityMode: 'SignAndEncrypt', securityPolicy: 'Basic256Sha256',
  username: 'reader', password: PASSWORD, samplingIntervalMs: 500, publishingIntervalMs: 1000,
})

describe('OPC UA connections: admin screen routes', () => {
  it('creates, edits, disables, maps and deletes a connection, each change audited', async () => {
    const created = await call('/api/admin/opcua', { method: 'POST', cookie: admin, json: connection('Boiler house server') })
    expect(created.status).toBe(201)
    const id = created.body.id as number
    expect(created.body.passwordSet).toBe(true)

    // Stored encrypted (AES-256-GCM, stored form v1.<iv>.<tag>.<ciphertext>), not as typed.
    const [row] = await sql`select password_secret, config_version from opcua_connections where id = ${id}`
    expect(row!.password_secret).toMatch(/^v1\./)
    expect(row!.password_secret).not.toContain(PASSWORD)

    const edited = await call(`/api/admin/opcua/${id}`, { method: 'PATCH', cookie: admin,
      json: { endpointUrl: 'opc.tcp://127.0.0.1:48411/brinkline', samplingIntervalMs: 250 } })
    expect(edited.status).toBe(200)
    expect(edited.body.endpointUrl).toBe('opc.tcp://127.0.0.1:48411/brinkline')
    const [afterEdit] = await sql`select sampling_interval_ms, password_secret, config_version from opcua_connections where id = ${id}`
    expect(afterEdit!.sampling_interval_ms).toBe(250)
    expect(afterEdit!.password_secret).toBe(row!.password_secret) // left out: the stored password stays
    expect(afterEdit!.config_version).toBe(row!.config_version + 1) // the owning collector restarts on it

    expect((await call(`/api/admin/opcua/${id}`, { method: 'PATCH', cookie: admin, json: { enabled: false } })).status).toBe(200)

    const tagRows = await sql`select id, code from tags where site_id = ${siteId} and retired_at is null order by id limit 2`
    const mappings = tagRows.map(t => ({ nodeId: `ns=2;s=Plant.${t.code}`, tagId: t.id as number }))
    const mapped = await call(`/api/admin/opcua/${id}/mappings`, { method: 'PUT', cookie: admin, json: { mappings } })
    expect(mapped.status).toBe(200)
    expect(mapped.body.mappings.map((m: { tagCode: string }) => m.tagCode)).toEqual(tagRows.map(t => t.code))

    const list = await call('/api/admin/opcua', { cookie: admin })
    expect(list.status).toBe(200)
    const listed = list.body.connections.find((c: { id: number }) => c.id === id)
    expect(listed.enabled).toBe(false)
    expect(Object.keys(listed.status)).toEqual(expect.arrayContaining(['state', 'lastValueAt', 'valuesPerMinute', 'lastError']))
    expect(listed.mappings).toHaveLength(2)

    const actions = await sql`select action, detail from audit_log where (detail->>'id')::int = ${id} and action like 'opcua.%' order by id`
    expect(actions.map(a => a.action)).toEqual(['opcua.connection.create', 'opcua.connection.update', 'opcua.connection.disable', 'opcua.mappings.replace'])
    expect(actions[1]!.detail.before.samplingIntervalMs).toBe(500)
    expect(actions[1]!.detail.after.samplingIntervalMs).toBe(250)

    expect((await call(`/api/admin/opcua/${id}`, { method: 'DELETE', cookie: admin })).status).toBe(200)
    expect(await sql`select 1 from opcua_connections where id = ${id}`).toHaveLength(0)
    expect(await sql`select 1 from opcua_mappings where connection_id = ${id}`).toHaveLength(0)
    const [deleted] = await sql`select detail from audit_log where action = 'opcua.connection.delete' and (detail->>'id')::int = ${id}`
    expect(deleted!.detail.before.name).toBe('Boiler house server')
    expect((await call(`/api/admin/opcua/${id}`, { method: 'DELETE', cookie: admin })).status).toBe(404)
  })

  it('never answers or audits the password, nor its stored form', async () => {
    const created = await call('/api/admin/opcua', { method: 'POST', cookie: admin, json: connection('Secret check server') })
    const id = created.body.id as number
    const changed = await call(`/api/admin/opcua/${id}`, { method: 'PATCH', cookie: admin, json: { password: 'another-Secret-7' } })
    expect(changed.status).toBe(200)
    const [row] = await sql`select password_secret from opcua_connections where id = ${id}`
    const list = await call('/api/admin/opcua', { cookie: admin })
    const audits = await sql`select detail from audit_log where (detail->>'id')::int = ${id} and action like 'opcua.%'`
    for (const text of [JSON.stringify(created.body), JSON.stringify(changed.body), JSON.stringify(list.body), JSON.stringify(audits)]) {
      expect(text).not.toContain(PASSWORD)
      expect(text).not.toContain('another-Secret-7')
      expect(text).not.toContain(row!.password_secret)
      expect(text).not.toContain('passwordSecret')
    }
    expect(audits.find(a => a.detail.passwordChanged)).toBeTruthy()
  })

  it('refuses every route to a non-admin with 403', async () => {
    const engineer = await signInAs('engineer')
    const [{ id }] = await sql`insert into opcua_connections (site_id, name, endpoint_url) values (${siteId}, 'Guarded server', 'opc.tcp://127.0.0.1:1') returning id`
    const tries: [string, string, unknown][] = [
      ['/api/admin/opcua', 'GET', undefined], ['/api/admin/opcua', 'POST', connection('Sneaky server')],
      [`/api/admin/opcua/${id}`, 'PATCH', { enabled: false }], [`/api/admin/opcua/${id}`, 'DELETE', undefined],
      [`/api/admin/opcua/${id}/mappings`, 'PUT', { mappings: [] }],
    ]
    for (const [path, method, json] of tries) {
      const res = await call(path, { method, cookie: engineer, json })
      expect(res.status, `${method} ${path}`).toBe(403)
    }
    expect((await call('/api/admin/opcua')).status).toBe(401)
    const [row] = await sql`select enabled from opcua_connections where id = ${id}`
    expect(row!.enabled).toBe(true)
    expect(await sql`select 1 from opcua_connections where name = 'Sneaky server'`).toHaveLength(0)
  })

  it('answers a bad field with 400 naming it, and stores nothing', async () => {
    const bad: [Record<string, unknown>, string][] = [
      [{ endpointUrl: 'http://127.0.0.1:4840' }, 'endpointUrl:'],
      [{ securityMode: 'Encrypt' }, 'securityMode:'],
      [{ securityMode: 'None', securityPolicy: 'Basic256Sha256' }, 'securityPolicy:'],
      [{ samplingIntervalMs: -5 }, 'samplingIntervalMs:'],
      [{ publishingIntervalMs: 0 }, 'publishingIntervalMs:'],
      [{ name: 'x' }, 'name:'],
      [{ passwordSecret: 'v1.a.b.c' }, 'passwordSecret'],
    ]
    for (const [change, field] of bad) {
      const res = await call('/api/admin/opcua', { method: 'POST', cookie: admin, json: { ...connection('Bad field server'), ...change } })
      expect(res.status, JSON.stringify(change)).toBe(400)
      expect(res.body.message).toContain(field)
    }
    expect(await sql`select 1 from opcua_connections where name = 'Bad field server'`).toHaveLength(0)

    const { body: { id } } = await call('/api/admin/opcua', { method: 'POST', cookie: admin, json: connection('Mapping check server') })
    const [tag] = await sql`select id from tags where site_id = ${siteId} and retired_at is null order by id limit 1`
    const badMaps: [unknown, string][] = [
      [[{ nodeId: 'Plant.TI-401', tagId: tag!.id }], 'mappings.0.nodeId:'],
      [[{ nodeId: 'ns=2;s=A', tagId: tag!.id }, { nodeId: 'ns=2;s=B', tagId: tag!.id }], 'mappings.1.tagId:'],
      [[{ nodeId: 'ns=2;s=A', tagId: 2_000_000_000 }], 'mappings.0.tagId:'],
    ]
    for (const [mappings, field] of badMaps) {
      const res = await call(`/api/admin/opcua/${id}/mappings`, { method: 'PUT', cookie: admin, json: { mappings } })
      expect(res.status, JSON.stringify(mappings)).toBe(400)
      expect(res.body.message).toContain(field)
    }
    expect((await call(`/api/admin/opcua/${id}`, { method: 'PATCH', cookie: admin, json: { securityMode: 'None' } })).status).toBe(400)
    expect((await call('/api/admin/opcua/abc', { method: 'PATCH', cookie: admin, json: {} })).body.message).toContain('id:')
  })

  it('shows the screen: an admin adds a connection through the form and opens its node table', async () => {
    const context = await launchChromium()
    try {
      const page = await context.newPage()
      await signInThroughForm(page, 'admin')
      await page.goto(url('/admin/opcua'))
      await page.locator('input[name=opcua-name]').fill('Kiln line server')
      await page.locator('input[name=opcua-endpoint]').fill('opc.tcp://127.0.0.1:48420/kiln')
      await page.locator('select[name=opcua-mode]').selectOption('Sign')
      await page.locator('select[name=opcua-policy]').selectOption('Basic256Sha256')
      await page.locator('input[name=opcua-user]').fill('reader')
      await page.locator('input[name=opcua-password]').fill('kiln-Secret-9')
      await page.getByRole('button', { name: 'Add connection' }).click()
      const row = page.getByRole('row', { name: /Kiln line server/ })
      await expect.poll(() => row.count()).toBe(1)
      expect(await row.textContent()).toContain('reader (password stored)')
      await row.getByRole('button', { name: 'Nodes' }).click()
      await page.getByRole('button', { name: 'Add node' }).click()
      await page.getByLabel('Node id 1').fill('ns=2;s=Kiln.TI-401')
      await page.getByRole('button', { name: 'Save node table' }).click()
      await expect.poll(async () => (await sql`select count(*)::int as n from opcua_mappings m
        join opcua_connections c on c.id = m.connection_id where c.name = 'Kiln line server'`)[0]!.n).toBe(1)
      await screenshot(page, 'admin-opcua-connections')
      expect(await page.content()).not.toContain('kiln-Secret-9')
    }
    finally {
      await context.close()
    }
  })
})
