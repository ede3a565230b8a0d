import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { OpcuaPlantServer, type PlantQuality } from '../../simulators/lib/opcuaPlantServer'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { eventually, freeLoopbackPort } from '../support/opcua'
import { createTestTag, runServerTask, waitForDemoSite } from '../support/pipeline'
import { postgres } from '../support/postgresControl'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// Issue 17 item 2: a real node-opcua server on loopback, in this process, feeds the collector of
// the built Brinkline server. Checks follow IEC 62541: status severity decides quality (Part 4
// §7.39), the source timestamp is the sample's time (Part 4 §7.7), history fills a gap (Part 11),
// and the server's own request log shows the client sent no Write, Call or node management (Part 4
// §5.8, §5.10.4, §5.11).
const pki = mkdtempSync(join(tmpdir(), 'brinkline-opcua-test-'))
// OP-103 carries a high-limit rule for the check that Bad and Uncertain values never alarm.
const TAGS = ['OP-101', 'OP-102', 'OP-103']
const plant = new OpcuaPlantServer({
  port: await freeLoopbackPort(),
  pkiDir: join(pki, 'plant'),
  historyValues: 10_000,
  units: [{ name: 'Test unit', tags: TAGS.map(code => ({ code, description: `Test ${code}`, engineeringUnit: 'K', rangeLow: 0, rangeHigh: 1000 })) }],
})
await plant.start()
await setupBuiltServer({
  ...MANUAL_TICKS_ENV,
  BRINKLINE_OPCUA_COLLECTOR: '1',
  BRINKLINE_OPCUA_POLL_MS: '300',
  BRINKLINE_OPCUA_MAX_BACKOFF_MS: '1000',
  BRINKLINE_OPCUA_PKI_DIR: join(pki, 'client'),
})
const sql = testSql()
afterAll(async () => {
  postgres('start') // in case the outage test failed with the database down
  await sql.end()
  await plant.stop()
})

// Source times a second apart, well in the past so no skew check is near.
const T0 = Date.now() - 3_600_000
let next = 0
const published: { tag: string, timeMs: number, value: number, quality: PlantQuality }[] = []
function publish(tag: string, quality: PlantQuality = 'good', value?: number) {
  const i = next++
  const reading = { tag, timeMs: T0 + 1000 * i, value: value ?? 300 + (i % 17) / 4, quality }
  published.push(reading)
  plant.publish(tag, reading.value, reading.timeMs, quality)
}

const stored = (tag: string) => sql<{ time: Date, value: number, quality: number }[]>`
  select s.time, s.value, s.quality from samples s join tags t on t.id = s.tag_id where t.code = ${tag} order by s.time`
async function storedAll(tag: string, count: number) {
  return eventually(`${count} samples of ${tag}`, async () => {
    const rows = await stored(tag)
    if (rows.length >= count) return rows
    const [c] = await sql`select state, last_error, rejected_count, config_version from opcua_connections where id = ${connectionId}`
    throw new Error(`${rows.length} stored; connection ${c!.state} (config ${c!.config_version}, ${c!.rejected_count} refused), last error ${c!.last_error}`)
  })
}
const expectedOf = (tag: string) => published.filter(p => p.tag === tag)
const QUALITY = { good: 0, uncertain: 1, bad: 2 }

let connectionId = 0
beforeAll(async () => {
  await waitForDemoSite(sql)
  for (const tag of TAGS) await createTestTag(sql, tag, 'T-400', 1)
  // The first value of each tag is on the server before the collector subscribes.
  for (const tag of TAGS) publish(tag)
  const [row] = await sql`
    insert into opcua_connections (site_id, name, endpoint_url, sampling_interval_ms, publishing_interval_ms)
    select site_id, 'Test plant', ${plant.endpointUrl}, 0, 200 from units where code = 'T-400' returning id`
  connectionId = row!.id as number
  await sql`
    insert into opcua_mappings (connection_id, node_id, tag_id, display_name)
    select ${connectionId}, 'ns=1;s=' || code, id, code from tags where code = any(${TAGS})`
  await eventually('the collector to connect', async () => {
    const [c] = await sql`select state, last_error from opcua_connections where id = ${connectionId}`
    if (c!.state !== 'connected') throw new Error(`state ${c!.state}, last error ${c!.last_error}`)
    return true
  })
})

describe('OPC UA collector', { timeout: 400_000 }, () => {
  it('stores every published value under its source timestamp, and reports the connection', async () => {
    for (let k = 0; k < 30; k++) publish(TAGS[k % 2]!)
    for (const tag of TAGS) {
      const rows = await storedAll(tag, expectedOf(tag).length)
      expect(rows.map(r => [r.time.getTime(), r.value, r.quality])).toEqual(expectedOf(tag).map(p => [p.timeMs, p.value, 0]))
    }
    const [c] = await sql`select state, owner, accepted_count, last_value_at from opcua_connections where id = ${connectionId}`
    expect(c!.state).toBe('connected')
    expect(c!.owner).toBeTruthy()
    expect(Number(c!.accepted_count)).toBe(published.length)
    expect((c!.last_value_at as Date).getTime()).toBe(Math.max(...published.map(p => p.timeMs)))
    // The mapping's time basis is written after the samples, so it is read again until it is set.
    const basesNow = async () => {
      const bases = await sql`select distinct time_basis from opcua_mappings where connection_id = ${connectionId}`
      return bases.length && bases.every(b => b.time_basis !== null) ? bases.map(b => b.time_basis) : undefined
    }
    expect(await eventually('time basis recorded', basesNow)).toEqual(['source'])
  })

  it('stores Bad and Uncertain values flagged with their quality', async () => {
    publish('OP-101', 'bad')
    publish('OP-101', 'uncertain')
    publish('OP-101', 'good')
    const rows = await storedAll('OP-101', expectedOf('OP-101').length)
    expect(rows.map(r => r.quality)).toEqual(expectedOf('OP-101').map(p => QUALITY[p.quality]))
    expect(rows.slice(-3).map(r => r.quality)).toEqual([2, 1, 0])
  })

  it('raises no alarm on Bad or Uncertain values far past a limit, and does on a Good one', async () => {
    // IEC 62541-4 §7.39: Bad means the value is not usable, Uncertain that it is of doubtful use;
    // an alarm on either would be a nuisance alarm on instrument trouble (EEMUA 191 [common practice]).
    const [rule] = await sql`
      insert into alarm_rules (site_id, target_kind, tag_id, unit_id, name, measure, comparison, threshold, priority, class, consequence, likely_cause, operator_action)
      select t.site_id, 'tag', t.id, t.unit_id, 'OP-103 high', 'value', 'above', 500, 'high', 'alarm', 'Test consequence.', 'Test cause.', 'Test action.'
      from tags t where t.code = 'OP-103' returning id`
    const alarmsOfRule = async () => (await sql`select count(*)::int as n from alarms where rule_id = ${rule!.id}`)[0]!.n as number
    for (let k = 0; k < 3; k++) {
      publish('OP-103', 'bad', 950)
      publish('OP-103', 'uncertain', 950)
    }
    const rows = await storedAll('OP-103', expectedOf('OP-103').length)
    expect(rows.slice(-6).map(r => [r.value, r.quality])).toEqual([[950, 2], [950, 1], [950, 2], [950, 1], [950, 2], [950, 1]])
    await runServerTask('indicators:refresh')
    // The tick did reach those samples (its claim moved to the newest of them), and raised nothing.
    const [claim] = await sql`select s.last_sample_time from tag_analysis_state s join tags t on t.id = s.tag_id where t.code = 'OP-103'`
    expect(claim?.last_sample_time?.getTime()).toBe(Math.max(...expectedOf('OP-103').map(p => p.timeMs)))
    expect(await alarmsOfRule()).toBe(0)
    // The same value with Good status does alarm, so the rule could have raised above.
    publish('OP-103', 'good', 950)
    await storedAll('OP-103', expectedOf('OP-103').length)
    await runServerTask('indicators:refresh')
    expect(await alarmsOfRule()).toBe(1)
  })

  it('loses no value across a server restart: the gap comes back from the server history', async () => {
    publish('OP-102')
    await storedAll('OP-102', expectedOf('OP-102').length)
    await plant.stop()
    await eventually('the collector to notice', async () => {
      const [c] = await sql`select state from opcua_connections where id = ${connectionId}`
      return c!.state !== 'connected' ? true : undefined
    })
    // Recorded by the plant while its OPC UA server was down, and just after it came back.
    for (let k = 0; k < 10; k++) publish(TAGS[k % 2]!)
    await plant.start()
    for (let k = 0; k < 10; k++) publish(TAGS[k % 2]!)
    for (const tag of TAGS) {
      const rows = await storedAll(tag, expectedOf(tag).length)
      expect(rows.map(r => [r.time.getTime(), r.value, r.quality]))
        .toEqual(expectedOf(tag).map(p => [p.timeMs, p.value, QUALITY[p.quality]]))
    }
    // The status row is written on the supervisor's next round, which may fall between subscribing
    // (state connected) and the end of the backfill: wait for the round that counts it.
    const [c] = await eventually('status after the restart', async () => {
      const rows = await sql`select state, state_since, reconnect_count, backfilled_count, last_error from opcua_connections where id = ${connectionId}`
      if (rows[0]!.state === 'connected' && Number(rows[0]!.reconnect_count) >= 1 && Number(rows[0]!.backfilled_count) > 0) return rows
      throw new Error(`status so far ${JSON.stringify(rows[0])}`)
    })
    expect(Number(c!.backfilled_count)).toBeGreaterThan(0)
  })

  it('loses no value across a database restart: the collector holds what arrives until PostgreSQL is back', async () => {
    publish('OP-101')
    await storedAll('OP-101', expectedOf('OP-101').length)
    const [before] = await sql`select reconnect_count, backfilled_count from opcua_connections where id = ${connectionId}`
    postgres('stop')
    for (let k = 0; k < 20; k++) publish(TAGS[k % 2]!)
    // Let the subscription deliver them while the database is away: the client asks for more only
    // after the server has answered a publish request, so a few more requests mean a few cycles
    // after the values were set (IEC 62541-4 §5.13.5).
    const publishes = plant.requests.get('PublishRequest') ?? 0
    await eventually('publish cycles during the outage', async () => ((plant.requests.get('PublishRequest') ?? 0) >= publishes + 3 ? true : undefined))
    postgres('start')
    for (const tag of TAGS) {
      const rows = await storedAll(tag, expectedOf(tag).length)
      expect(rows.map(r => [r.time.getTime(), r.value, r.quality]))
        .toEqual(expectedOf(tag).map(p => [p.timeMs, p.value, QUALITY[p.quality]]))
    }
    // They came through the collector's memory (a store waiting for the database, or the buffer
    // after a refused one): the OPC UA session stayed up and nothing was read back from history.
    const [after] = await eventually('status written after the outage', async () => {
      const rows = await sql`select state, accepted_count, reconnect_count, backfilled_count from opcua_connections where id = ${connectionId}`
      return rows[0]!.state === 'connected' && Number(rows[0]!.accepted_count) >= published.length ? rows : undefined
    })
    expect(Number(after!.reconnect_count)).toBe(Number(before!.reconnect_count))
    expect(Number(after!.backfilled_count)).toBe(Number(before!.backfilled_count))
  })

  it('lets an admin walk the server\'s address space down to the variables, read-only', async () => {
    // IEC 62541-4 §5.8.2 Browse, hierarchical references forward from the Objects folder (ns=0;i=85, Part 5 §8.2.4).
    const admin = await signInAs('admin')
    const browse = (nodeId?: string) => call(`/api/admin/opcua/${connectionId}/browse${nodeId ? `?nodeId=${encodeURIComponent(nodeId)}` : ''}`, { cookie: admin })
    const top = await browse()
    expect(top.status).toBe(200)
    const plantFolder = (top.body.children as { nodeId: string, displayName: string, nodeClass: string }[]).find(c => c.displayName === 'Plant')
    expect(plantFolder?.nodeClass).toBe('Object')
    const units = await browse(plantFolder!.nodeId)
    const unit = (units.body.children as { nodeId: string, displayName: string }[]).find(c => c.displayName === 'Test unit')
    expect(unit).toBeTruthy()
    const variables = await browse(unit!.nodeId)
    expect(variables.status).toBe(200)
    const found = (variables.body.children as { nodeId: string, displayName: string, nodeClass: string }[])
      .filter(c => c.nodeClass === 'Variable').map(c => [c.nodeId, c.displayName])
    expect(found).toEqual(TAGS.map(code => [`ns=1;s=${code}`, code]))
    // What an AnalogItem carries (IEC 62541-8 §5.3.2: EngineeringUnits and EURange properties) and
    // its Description attribute (Part 3 §5.2.8), as the test server declared them.
    const op101 = (variables.body.children as { nodeId: string, facts: unknown }[]).find(c => c.nodeId === 'ns=1;s=OP-101')
    expect(op101?.facts).toEqual({ description: 'Test OP-101', engineeringUnit: 'K', rangeLow: 0, rangeHigh: 1000 })

    const malformed = await browse('not a node')
    expect(malformed.status).toBe(400)
    expect(malformed.body.message).toMatch(/nodeId: /)
    const unknown = await browse('ns=1;s=NO-SUCH-NODE')
    expect(unknown.status).toBe(400)
    expect(unknown.body.message).toMatch(/nodeId: /)
    // A server that does not answer is the connection's endpoint to check, not a fault of ours (no 5xx).
    const [row] = await sql`insert into opcua_connections (site_id, name, endpoint_url, enabled)
      select site_id, 'Nobody there', 'opc.tcp://127.0.0.1:' || ${await freeLoopbackPort()} || '/none', false from opcua_connections where id = ${connectionId} returning id`
    const unreachable = await call(`/api/admin/opcua/${row!.id}/browse`, { cookie: admin })
    expect(unreachable.status).toBe(422)
    expect(unreachable.body.message).toMatch(/endpointUrl: /)
    expect((await call('/api/admin/opcua/999999/browse', { cookie: admin })).status).toBe(404)
    expect(plant.requests.get('BrowseRequest')).toBeGreaterThan(0)
  })

  it('makes a tag from a browsed variable and reads it at once, refusing what the workbench would', async () => {
    const admin = await signInAs('admin')
    const [unit] = await sql`select id from units where code = 'T-400'`
    const make = (body: unknown) => call(`/api/admin/opcua/${connectionId}/tags`, { method: 'POST', cookie: admin, json: body })
    const tag = { unitId: unit!.id, code: 'ti-104', description: 'Test OP-104', engineeringUnit: 'K', samplePeriodS: 1, rangeLow: 0, rangeHigh: 1000 }
    // The workbench's own contract: ISA-5.1 code (shared/schemas/plant.ts), range high above low.
    const badCode = await make({ nodeId: 'ns=1;s=OP-104', tag: { ...tag, code: 'reactor temp' } })
    expect(badCode.status).toBe(400)
    expect(badCode.body.message).toMatch(/tag\.code: /)
    const badRange = await make({ nodeId: 'ns=1;s=OP-104', tag: { ...tag, rangeHigh: -1 } })
    expect(badRange.status).toBe(400)
    expect(badRange.body.message).toMatch(/tag\.rangeHigh: /)
    const taken = await make({ nodeId: 'ns=1;s=OP-101', tag })
    expect(taken.status).toBe(409)
    expect(taken.body.message).toMatch(/^nodeId: /)
    const sameCode = await make({ nodeId: 'ns=1;s=OP-104', tag: { ...tag, code: 'OP-101' } })
    expect(sameCode.status).toBe(409)
    expect(sameCode.body.message).toMatch(/tag\.code: /)
    expect((await sql`select count(*)::int as n from tags where code = 'TI-104'`)[0]!.n).toBe(0)

    plant.addTag('Test unit', { code: 'OP-104', description: 'Test OP-104', engineeringUnit: 'K', rangeLow: 0, rangeHigh: 1000 })
    const made = await make({ nodeId: 'ns=1;s=OP-104', displayName: 'OP-104', tag })
    expect(made.status).toBe(201)
    expect(made.body.code).toBe('TI-104')
    const audit = await sql`select action from audit_log where action in ('tag.create', 'opcua.mapping.add') order by id`
    expect(audit.map(a => a.action)).toEqual(['tag.create', 'opcua.mapping.add'])
    // The collector restarts on the new config version and subscribes to the new node.
    const reading = { timeMs: T0 + 1000 * next++, value: 321.5 }
    plant.publish('OP-104', reading.value, reading.timeMs)
    const rows = await eventually('the new tag\'s value', async () => {
      const got = await stored('TI-104')
      if (got.length > 0) return got
      const [c] = await sql`select state, state_since, owner, config_version, last_error from opcua_connections where id = ${connectionId}`
      throw new Error(`none yet; ${JSON.stringify(c)}; plant sessions ${plant.sessionCount}, `
        + `subscriptions made ${plant.requests.get('CreateSubscriptionRequest')}, monitored-item requests ${plant.requests.get('CreateMonitoredItemsRequest')}`)
    })
    expect(rows.map(r => [r.time.getTime(), r.value])).toEqual([[reading.timeMs, reading.value]])
  })

  it('never sent a request that could change the plant', () => {
    // The counter sees the collector's traffic (so it can fail), and no Write, Call, HistoryUpdate or node management.
    expect(plant.requests.get('CreateMonitoredItemsRequest')).toBeGreaterThan(0)
    expect(plant.requests.get('HistoryReadRequest')).toBeGreaterThan(0)
    expect(plant.plantChangingRequests()).toEqual({})
  })
})
