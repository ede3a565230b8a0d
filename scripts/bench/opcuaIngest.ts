// Values per second from one OPC UA connection into PostgreSQL, beside POST /api/ingest, in one
// run on one stack (issue 17). The OPC UA side is the product's real path: a node-opcua plant
// server on loopback (simulators/lib/opcuaPlantServer.ts), the collector's subscription with
// monitored items, its sample buffer and ingestBatch. It prints what it measured, nothing more.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { OpcuaPlantServer } from '../../simulators/lib/opcuaPlantServer'
import { plantNodeId } from '../../shared/demo/opcuaDemo'
import { postRows } from './ingest'
import { freePort, perSecond, startStack } from './support/stack'

const TAGS = 20
// Values per tag set on the server before waiting for them to be stored: below the collector's
// monitored-item queue (1000, server/services/opcua/collector.ts), so the server drops none.
const BURST_PER_TAG = 500
const BURSTS = 10
const VALUES = TAGS * BURST_PER_TAG * BURSTS

const codes = Array.from({ length: TAGS }, (_, i) => `BI-${900 + i}`)
const sleep = (ms: number) => new Promise(resolve => setTimeout(resolve, ms))

export async function run(): Promise<void> {
  const pki = mkdtempSync(join(tmpdir(), 'brinkline-bench-opcua-'))
  const plant = new OpcuaPlantServer({
    port: await freePort(), pkiDir: join(pki, 'plant'),
    units: [{ name: 'Bench unit', tags: codes.map(code => ({ code, description: `Bench ${code}`, engineeringUnit: 'K', rangeLow: 0, rangeHigh: 1e6 })) }],
  })
  await plant.start()
  // Only ingest runs: the pipeline's ticks would compete for the two cores with either side.
  const stack = await startStack({ NUXT_PIPELINE_SCHEDULED: 'false', NUXT_SENDER_SCHEDULED: 'false',
    BRINKLINE_OPCUA_POLL_MS: '500', BRINKLINE_OPCUA_PKI_DIR: join(pki, 'client') })
  const { sql } = stack
  try {
    const tags: { id: number, code: string }[] = []
    for (const code of codes) {
      const [row] = await sql<{ id: number }[]>`
        insert into tags (site_id, unit_id, code, description, engineering_unit, sample_period_s, range_low, range_high)
        select site_id, id, ${code}, ${`Bench ${code}`}, 'K', 1, 0, 1000000 from units order by id limit 1 returning id`
      tags.push({ id: row!.id, code })
    }
    const ids = tags.map(t => t.id)
    const storedCount = async () => (await sql<{ n: number }[]>`select count(*)::int as n from samples where tag_id = any(${ids})`)[0]!.n

    // HTTP: the same tags and number of values, one gateway posting batches of 5,000.
    const base = Date.UTC(2021, 0, 1)
    const httpRows = Array.from({ length: VALUES }, (_, i) => ({ tagId: tags[i % TAGS]!.id, code: tags[i % TAGS]!.code,
      timeMs: base + Math.floor(i / TAGS) * 1000, value: i % 997 }))
    const httpMs = await postRows(stack.url, httpRows, 1)

    // OPC UA: one connection reporting every change (sampling 0), publishing every 100 ms.
    const [connection] = await sql<{ id: number }[]>`
      insert into opcua_connections (site_id, name, endpoint_url, sampling_interval_ms, publishing_interval_ms)
      select site_id, 'Bench plant', ${plant.endpointUrl}, 0, 100 from tags where id = ${ids[0]!} returning id`
    for (const tag of tags)
      await sql`insert into opcua_mappings (connection_id, node_id, tag_id) values (${connection!.id}, ${plantNodeId(tag.code)}, ${tag.id})`
    for (let i = 0; ; i++) {
      const [c] = await sql<{ state: string }[]>`select state from opcua_connections where id = ${connection!.id}`
      if (c!.state === 'connected') break
      if (i > 1200) throw new Error('the collector did not connect within 10 minutes')
      await sleep(500)
    }
    const before = await storedCount()
    const opcuaBase = Date.UTC(2022, 0, 1)
    let published = 0
    const t0 = performance.now()
    for (let burst = 0; burst < BURSTS; burst++) {
      for (let k = 0; k < BURST_PER_TAG; k++) {
        const timeMs = opcuaBase + (burst * BURST_PER_TAG + k) * 1000
        for (const code of codes) plant.publish(code, k % 997, timeMs)
      }
      published += TAGS * BURST_PER_TAG
      while (await storedCount() - before < published) await sleep(20)
    }
    const opcuaMs = performance.now() - t0
    const stored = await storedCount() - before
    const [counts] = await sql<{ accepted_count: number, rejected_count: number }[]>`
      select accepted_count::int, rejected_count::int from opcua_connections where id = ${connection!.id}`
    const httpRate = perSecond(VALUES, httpMs)
    const opcuaRate = perSecond(VALUES, opcuaMs)
    console.log(`values per side: ${VALUES.toLocaleString('en')} (${TAGS} tags)`)
    console.log(`POST /api/ingest : ${httpRate.toLocaleString('en')} values/s (one gateway, batches of 5,000)`)
    console.log(`OPC UA collector : ${opcuaRate.toLocaleString('en')} values/s (one connection, ${BURSTS} bursts of ${BURST_PER_TAG} values per tag, `
      + 'each waited for until stored; sampling 0, publishing 100 ms)')
    console.log(`ratio OPC UA/HTTP: ${(opcuaRate / httpRate).toFixed(2)}   OPC UA values stored: ${stored.toLocaleString('en')}, `
      + `accepted ${counts!.accepted_count.toLocaleString('en')}, refused ${counts!.rejected_count}; plant-changing requests: ${JSON.stringify(plant.plantChangingRequests())}`)
  }
  finally {
    await stack.stop()
    await plant.stop()
    rmSync(pki, { recursive: true, force: true })
  }
}
