import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { OpcuaPlantServer } from '../../simulators/lib/opcuaPlantServer'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { eventually, freeLoopbackPort } from '../support/opcua'
import { createTestTag, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer, startServerInstance, type ServerInstance } from '../support/server'

// Issue 17: one collector per OPC UA connection even with several server instances on one
// database. Two instances run the collector; a PostgreSQL session advisory lock per connection
// decides the owner (PostgreSQL manual, "Advisory Locks": a session-level lock is held until
// released or the session ends [from memory]). The file's own server answers requests only.
const pki = mkdtempSync(join(tmpdir(), 'brinkline-opcua-owner-'))
const TAGS = ['OW-101', 'OW-102']
const plant = new OpcuaPlantServer({
  port: await freeLoopbackPort(),
  pkiDir: join(pki, 'plant'),
  historyValues: 10_000,
  units: [{ name: 'Owner unit', tags: TAGS.map(code => ({ code, description: `Test ${code}`, engineeringUnit: 'K', rangeLow: 0, rangeHigh: 1000 })) }],
})
await plant.start()
await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(async () => {
  await sql.end()
  await plant.stop()
})

const collecting = (name: string) => ({
  BRINKLINE_OPCUA_COLLECTOR: '1', BRINKLINE_OPCUA_POLL_MS: '300', BRINKLINE_OPCUA_MAX_BACKOFF_MS: '1000',
  BRINKLINE_OPCUA_PKI_DIR: join(pki, name),
})
let instances: ServerInstance[] = []
let connectionId = 0
const T0 = Date.now() - 3_600_000
let next = 0
function publishRound() {
  const timeMs = T0 + 1000 * next++
  for (const tag of TAGS) plant.publish(tag, 300 + next / 4, timeMs)
}
const connection = async () => (await sql`
  select state, owner, accepted_count::int, duplicate_count::int, last_error from opcua_connections where id = ${connectionId}`)[0]!
const storedCount = async () => (await sql`
  select count(*)::int as n from samples s join tags t on t.id = s.tag_id where t.code = any(${TAGS})`)[0]!.n as number
/** The instance whose process id the connection row names as owner (host:pid:suffix). */
const ownerOf = (owner: string | null) => instances.find(i => owner?.split(':')[1] === String(i.pid))

beforeAll(async () => {
  await waitForDemoSite(sql)
  for (const tag of TAGS) await createTestTag(sql, tag, 'T-400', 1)
  const [row] = await sql`
    insert into opcua_connections (site_id, name, endpoint_url, sampling_interval_ms, publishing_interval_ms)
    select site_id, 'Owner test plant', ${plant.endpointUrl}, 0, 200 from units where code = 'T-400' returning id`
  connectionId = row!.id as number
  await sql`insert into opcua_mappings (connection_id, node_id, tag_id)
    select ${connectionId}, 'ns=1;s=' || code, id from tags where code = any(${TAGS})`
  // Started together, so both supervisors try for the connection in the same moments.
  instances = await Promise.all([startServerInstance(collecting('a')), startServerInstance(collecting('b'))])
})

describe('one OPC UA collector per connection across two server instances', { timeout: 400_000 }, () => {
  it('has exactly one instance collect, and the other take over when it stops, losing no value', async () => {
    for (const instance of instances) expect(instance.logs()).toContain('[opcua] collector started')
    const first = await eventually('one instance to connect', async () => {
      const c = await connection()
      return c.state === 'connected' ? ownerOf(c.owner) : undefined
    })
    expect(first, 'the owner is one of the two instances').toBeDefined()
    for (let k = 0; k < 20; k++) publishRound()
    await eventually('the values stored', async () => (await storedCount() >= 2 * next ? true : undefined))
    // Several supervisor rounds have passed on both: still one session on the plant server, and
    // no value stored twice (a second collector would have made every value a duplicate).
    expect(plant.sessionCount).toBe(1)
    let c = await connection()
    expect(ownerOf(c.owner)).toBe(first)
    expect([c.accepted_count, c.duplicate_count]).toEqual([2 * next, 0])

    // The owner crashes: its database session ends, the lock goes with it, and the other instance
    // takes the connection and fills the gap from the server's history.
    await first!.stop('SIGKILL')
    for (let k = 0; k < 10; k++) publishRound()
    const second = await eventually('the other instance to take over', async () => {
      const row = await connection()
      const owner = ownerOf(row.owner)
      return row.state === 'connected' && owner && owner !== first ? owner : undefined
    })
    expect(second).toBe(instances.find(i => i !== first))
    for (let k = 0; k < 10; k++) publishRound()
    await eventually('every value stored once', async () => (await storedCount() >= 2 * next ? true : undefined))
    expect(await storedCount()).toBe(2 * next)
    c = await connection()
    expect(ownerOf(c.owner)).toBe(second)
    expect(plant.plantChangingRequests()).toEqual({})
  })
})
