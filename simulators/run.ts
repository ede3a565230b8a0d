// Demo plant runner: simulates the units of the catalogue and posts their samples to Brinkline's
// ingest API as a gateway would; with --opcua-port, the OPC UA units (shared/demo/opcuaDemo.ts)
// are served from a local OPC UA server instead, as a plant's control system would publish them.
// See lib/runOptions.ts for the options.
import { CATALOGUE, catalogueUnit, type UnitCode } from '../shared/demo/catalogue'
import { IngestClient } from './lib/ingestClient'
import { OpcuaServedUnits, opcuaUnitsOf } from './lib/opcuaServedUnits'
import { deriveSeed, seededNormal } from './lib/random'
import { parseRunOptions, USAGE, type RunOptions } from './lib/runOptions'
import { UnitSampler } from './lib/unitSampler'
import { createUnit } from './units/createUnit'

const TICK_MS = 1_000
const STATUS_MS = 30_000
// Backfill a slice of history at a time and let the client drain between slices, so a long
// history never overruns the buffer bound.
const BACKFILL_SLICE_MS = 10 * 60_000
const BACKFILL_BUFFER_HIGH_WATER = 20_000
const FINAL_FLUSH_MS = 10_000

function createSampler(code: UnitCode, options: RunOptions, startMs: number): UnitSampler {
  const unit = createUnit(code, { speed: options.speed, normal: seededNormal(deriveSeed(options.seed, `${code}:process`)) })
  return new UnitSampler(unit, catalogueUnit(code), seededNormal(deriveSeed(options.seed, `${code}:sensors`)), startMs)
}

function statusLine(client: IngestClient, samplers: UnitSampler[], served?: OpcuaServedUnits): string {
  const s = client.stats
  const units = samplers.map(sampler => `${catalogueUnit(sampler.unit.code).name.split(' ')[0]}: ${sampler.unit.describe()}`)
  const error = s.lastError && s.buffered > 0 ? ` | last error: ${s.lastError}` : ''
  return `${new Date().toISOString()} accepted ${s.accepted}, duplicates ${s.duplicates}, rejected ${s.rejected}, `
    + `buffered ${s.buffered}, dropped ${s.dropped}${error}${served ? `, served over OPC UA ${served.published}` : ''} | ${units.join(' | ')}`
}

async function backfill(samplers: UnitSampler[], client: IngestClient, fromMs: number, toMs: number): Promise<void> {
  for (let sliceEnd = fromMs + BACKFILL_SLICE_MS; ; sliceEnd += BACKFILL_SLICE_MS) {
    const until = Math.min(sliceEnd, toMs)
    for (const sampler of samplers) client.enqueue(sampler.samplesUntil(until))
    if (client.stats.buffered > BACKFILL_BUFFER_HIGH_WATER) await client.idle()
    if (until === toMs) return
  }
}

async function main(): Promise<void> {
  let options: RunOptions
  try { options = parseRunOptions(process.argv.slice(2), process.env) }
  catch (error) {
    console.error(`${(error as Error).message}\n${USAGE}`)
    process.exit(2)
  }
  const client = new IngestClient({ baseUrl: options.url, key: options.key })
  const nowMs = Date.now()
  const startMs = nowMs - options.backfillHours * 3_600_000
  const opcuaUnits = opcuaUnitsOf(options.units, options.opcuaPort)
  const httpSamplers = options.units.filter(code => !opcuaUnits.includes(code)).map(code => createSampler(code, options, startMs))
  // The OPC UA units start now: their history is what the plant server records from here on.
  const opcuaSamplers = opcuaUnits.map(code => createSampler(code, options, nowMs))
  const samplers = [...httpSamplers, ...opcuaSamplers]
  const names = (codes: UnitCode[]) => codes.map(code => CATALOGUE.find(u => u.code === code)!.name).join(', ')
  console.log(`simulating ${names(options.units)} → ${options.url} (speed ${options.speed}, seed ${options.seed})`)
  let served: OpcuaServedUnits | undefined
  if (opcuaUnits.length > 0) {
    served = new OpcuaServedUnits(opcuaUnits, options.opcuaPort!, options.opcuaPkiDir)
    await served.start()
    console.log(`serving ${names(opcuaUnits)} over OPC UA at ${served.endpointUrl} (not posted over HTTP)`)
  }

  let stopping = false
  const stop = async (signal: string) => {
    if (stopping) return
    stopping = true
    clearInterval(ticker)
    clearInterval(reporter)
    console.log(`${signal}: final flush of ${client.stats.buffered} samples`)
    const unsent = await client.close(FINAL_FLUSH_MS)
    await served?.stop()
    console.log(`stopped: ${statusLine(client, samplers, served)}${unsent ? ` | ${unsent} samples not sent` : ''}`)
    process.exit(0)
  }
  process.once('SIGINT', () => void stop('SIGINT'))
  process.once('SIGTERM', () => void stop('SIGTERM'))

  const reporter = setInterval(() => console.log(statusLine(client, samplers, served)), STATUS_MS)
  // eslint-disable-next-line prefer-const -- stop() reads it during the backfill, before it is set
  let ticker: NodeJS.Timeout | undefined
  if (options.backfillHours > 0) {
    console.log(`backfilling ${options.backfillHours} h of history`)
    await backfill(httpSamplers, client, startMs, Date.now())
    console.log(`backfill done: ${statusLine(client, samplers, served)}`)
  }
  if (stopping) return
  ticker = setInterval(() => {
    const now = Date.now()
    for (const sampler of httpSamplers) client.enqueue(sampler.samplesUntil(now))
    for (const sampler of opcuaSamplers) served!.publish(sampler.samplesUntil(now))
  }, TICK_MS)
}

await main()
