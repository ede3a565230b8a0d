// Demo plant runner: simulates the units of the catalogue and posts their samples to Brinkline's
// ingest API as a gateway would. See lib/runOptions.ts for the options.
import { CATALOGUE, catalogueUnit, type UnitCode } from '../shared/demo/catalogue'
import { IngestClient } from './lib/ingestClient'
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

function statusLine(client: IngestClient, samplers: UnitSampler[]): string {
  const s = client.stats
  const units = samplers.map(sampler => `${catalogueUnit(sampler.unit.code).name.split(' ')[0]}: ${sampler.unit.describe()}`)
  const error = s.lastError && s.buffered > 0 ? ` | last error: ${s.lastError}` : ''
  return `${new Date().toISOString()} accepted ${s.accepted}, duplicates ${s.duplicates}, rejected ${s.rejected}, `
    + `buffered ${s.buffered}, dropped ${s.dropped}${error} | ${units.join(' | ')}`
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
  const samplers = options.units.map(code => createSampler(code, options, startMs))
  const names = options.units.map(code => CATALOGUE.find(u => u.code === code)!.name).join(', ')
  console.log(`simulating ${names} → ${options.url} (speed ${options.speed}, seed ${options.seed})`)

  let stopping = false
  const stop = async (signal: string) => {
    if (stopping) return
    stopping = true
    clearInterval(ticker)
    clearInterval(reporter)
    console.log(`${signal}: final flush of ${client.stats.buffered} samples`)
    const unsent = await client.close(FINAL_FLUSH_MS)
    console.log(`stopped: ${statusLine(client, samplers)}${unsent ? ` | ${unsent} samples not sent` : ''}`)
    process.exit(0)
  }
  process.once('SIGINT', () => void stop('SIGINT'))
  process.once('SIGTERM', () => void stop('SIGTERM'))

  const reporter = setInterval(() => console.log(statusLine(client, samplers)), STATUS_MS)
  // eslint-disable-next-line prefer-const -- stop() reads it during the backfill, before it is set
  let ticker: NodeJS.Timeout | undefined
  if (options.backfillHours > 0) {
    console.log(`backfilling ${options.backfillHours} h of history`)
    await backfill(samplers, client, startMs, Date.now())
    console.log(`backfill done: ${statusLine(client, samplers)}`)
  }
  if (stopping) return
  ticker = setInterval(() => {
    const now = Date.now()
    for (const sampler of samplers) client.enqueue(sampler.samplesUntil(now))
  }, TICK_MS)
}

await main()
