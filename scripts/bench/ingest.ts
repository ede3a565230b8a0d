// API ingest against the ceiling: raw COPY of the same rows into the same table, in one run.
// Goal (docs/design.md §D11): API rows/s ≥ 0.5 × COPY rows/s.
import { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { BENCH_SIM_KEY, perSecond, startStack } from './support/stack'

const ROWS_PER_ROUND = 250_000
const ROUNDS = 2
const BATCH = 5_000
const CONCURRENT_GATEWAYS = 2

interface Row { tagId: number, code: string, timeMs: number, value: number }

function makeRows(tags: { id: number, code: string }[], startMs: number, count: number): Row[] {
  const rows: Row[] = []
  for (let i = 0; rows.length < count; i++) {
    for (const tag of tags) {
      if (rows.length === count) break
      rows.push({ tagId: tag.id, code: tag.code, timeMs: startMs + i * 1000, value: Math.sin(i / 50) * 10 + Math.random() })
    }
  }
  return rows
}

async function copyRows(sql: import('postgres').Sql, rows: Row[]): Promise<number> {
  const t0 = performance.now()
  const writable = await sql`copy samples (tag_id, time, value, quality) from stdin`.writable()
  const lines = function* () {
    for (let i = 0; i < rows.length; i += 10_000)
      yield rows.slice(i, i + 10_000).map(r => `${r.tagId}\t${new Date(r.timeMs).toISOString()}\t${r.value}\t0\n`).join('')
  }
  await pipeline(Readable.from(lines()), writable)
  return performance.now() - t0
}

/** Posts the rows in batches from `gateways` concurrent senders; the time it took, in ms. Also used by opcuaIngest.ts. */
export async function postRows(url: string, rows: Row[], gateways = CONCURRENT_GATEWAYS): Promise<number> {
  const batches: Row[][] = []
  for (let i = 0; i < rows.length; i += BATCH) batches.push(rows.slice(i, i + BATCH))
  const t0 = performance.now()
  const worker = async () => {
    for (let batch = batches.shift(); batch; batch = batches.shift()) {
      const res = await fetch(`${url}/api/ingest`, {
        method: 'POST', headers: { 'authorization': `Bearer ${BENCH_SIM_KEY}`, 'content-type': 'application/json' },
        body: JSON.stringify({ samples: batch.map(r => ({ tag: r.code, time: r.timeMs, value: r.value })) }),
      })
      const body = await res.json() as { accepted: number }
      if (res.status !== 200 || body.accepted !== batch.length) throw new Error(`ingest answered ${res.status}: ${JSON.stringify(body).slice(0, 200)}`)
    }
  }
  await Promise.all(Array.from({ length: gateways }, worker))
  return performance.now() - t0
}

export async function run(): Promise<void> {
  // The live pipeline would compete with ingest for the two cores; this measures ingest alone.
  const stack = await startStack({ NUXT_PIPELINE_SCHEDULED: 'false', NUXT_SENDER_SCHEDULED: 'false' })
  try {
    const tags = await stack.sql<{ id: number, code: string }[]>`select id, code from tags order by id`
    let copyMs = 0
    let apiMs = 0
    // Interleave rounds so neither side always meets the smaller table.
    for (let round = 0; round < ROUNDS; round++) {
      // In the past: live ingest refuses times far ahead of the server clock.
      const base = Date.UTC(2020, 0, 1) + round * 2 * 86_400_000 * 10
      copyMs += await copyRows(stack.sql, makeRows(tags, base, ROWS_PER_ROUND))
      apiMs += await postRows(stack.url, makeRows(tags, base + 86_400_000 * 10, ROWS_PER_ROUND))
    }
    const rows = ROWS_PER_ROUND * ROUNDS
    const [{ n }] = await stack.sql<{ n: number }[]>`select count(*)::int as n from samples`
    const copyRate = perSecond(rows, copyMs)
    const apiRate = perSecond(rows, apiMs)
    console.log(`rows per side: ${rows.toLocaleString('en')} (${tags.length} tags, batches of ${BATCH}, ${CONCURRENT_GATEWAYS} concurrent gateways)`)
    console.log(`raw COPY      : ${copyRate.toLocaleString('en')} rows/s`)
    console.log(`POST /api/ingest: ${apiRate.toLocaleString('en')} rows/s (JSON over HTTP, validation, one transaction per batch)`)
    console.log(`ratio API/COPY: ${(apiRate / copyRate).toFixed(2)}  (goal ≥ 0.50)   rows stored: ${n.toLocaleString('en')}`)
  }
  finally {
    await stack.stop()
  }
}
