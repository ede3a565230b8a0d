// Overview API latency with 1,000 watched tags while gateways keep posting samples, beside the
// same requests on an idle server; and the JavaScript the overview page loads, beside the tag
// page's (which carries the chart library). Goal (docs/design.md §D11): p95 < 100 ms, page JS small.
import { gzipSync } from 'node:zlib'
import { BENCH_PASSWORD, BENCH_SIM_KEY, startStack, type BenchStack } from './support/stack'

const TAGS = 1_000
const HISTORY_SAMPLES = 200
const REQUESTS = 200
const WARMUP = 20
const INGEST_WORKERS = 2

async function addTags(stack: BenchStack) {
  const [{ n }] = await stack.sql<{ n: number }[]>`select count(*)::int as n from tags`
  // Spread the extra tags over the demo units, as a plant's tags are spread over its units.
  await stack.sql`
    insert into tags (site_id, unit_id, code, description, engineering_unit, sample_period_s, range_low, range_high)
    select u.site_id, u.id, 'XI-' || (1000 + g), 'Bench signal ' || g, 'K', 2, 0, 100
    from generate_series(1, ${TAGS - n}) g
    join lateral (select id, site_id from units order by id offset (g % (select count(*) from units)) limit 1) u on true`
  // Recent history for every tag (sparklines read the newest 96) and a status row for each, as the
  // pipeline would have written.
  await stack.sql`
    insert into samples (tag_id, time, value, quality)
    select t.id, now() - make_interval(secs => 2 * i), 50 + 5 * sin(i / 10.0) + random(), 0
    from tags t, generate_series(1, ${HISTORY_SAMPLES}) i
    on conflict do nothing`
  await stack.sql`
    insert into tag_status (tag_id, status, reason, latest_value, latest_time, leading_indicator, leading_value, tau, p_value)
    select id, 'steady', '', 50, now(), 'ar1', 0.5, 0.1, 0.4 from tags
    on conflict do nothing`
  await stack.sql`analyze`
  return stack.sql<{ code: string }[]>`select code from tags order by id`
}

async function signIn(url: string): Promise<string> {
  const res = await fetch(`${url}/api/public/sign-in`, {
    method: 'POST', headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'operator@harrowgate.example', password: BENCH_PASSWORD }),
  })
  if (res.status !== 200) throw new Error(`sign-in answered ${res.status}`)
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

/** Every tag gets a fresh sample per batch, from each worker in turn, until stopped. */
function startIngest(url: string, codes: string[]) {
  let running = true
  let rows = 0
  const t0 = performance.now()
  const worker = async (offsetMs: number) => {
    for (let round = 0; running; round++) {
      const time = Date.now() + offsetMs + round
      const res = await fetch(`${url}/api/ingest`, {
        method: 'POST', headers: { 'authorization': `Bearer ${BENCH_SIM_KEY}`, 'content-type': 'application/json' },
        body: JSON.stringify({ samples: codes.map(code => ({ tag: code, time, value: 50 + Math.random() })) }),
      })
      if (res.status !== 200) throw new Error(`ingest answered ${res.status}`)
      rows += ((await res.json()) as { accepted: number }).accepted
    }
  }
  const workers = Array.from({ length: INGEST_WORKERS }, (_, i) => worker(i * 500))
  return {
    async stop() {
      running = false
      await Promise.all(workers)
      return Math.round(rows / ((performance.now() - t0) / 1000))
    },
  }
}

async function timeOverview(url: string, cookie: string) {
  const times: number[] = []
  for (let i = 0; i < WARMUP + REQUESTS; i++) {
    const t0 = performance.now()
    const res = await fetch(`${url}/api/overview`, { headers: { cookie } })
    const body = await res.json() as { units: { tiles: unknown[] }[] }
    if (res.status !== 200) throw new Error(`overview answered ${res.status}`)
    if (i === 0 && body.units.reduce((n, u) => n + u.tiles.length, 0) !== TAGS) throw new Error('overview did not list every tag')
    if (i >= WARMUP) times.push(performance.now() - t0)
  }
  times.sort((a, b) => a - b)
  const at = (q: number) => times[Math.min(times.length - 1, Math.ceil(q * times.length) - 1)]!
  return { p50: at(0.5), p95: at(0.95), max: times.at(-1)! }
}

/** The JavaScript a page loads on first visit: its entry script and every module it preloads. */
async function pageScripts(url: string, path: string, cookie: string) {
  const html = await (await fetch(`${url}${path}`, { headers: { cookie } })).text()
  const srcs = new Set([...html.matchAll(/<script[^>]+src="([^"]+\.js)"/g), ...html.matchAll(/<link[^>]+rel="modulepreload"[^>]+href="([^"]+\.js)"/g)].map(m => m[1]!))
  let raw = 0
  let gzip = 0
  for (const src of srcs) {
    const body = Buffer.from(await (await fetch(new URL(src, url))).arrayBuffer())
    raw += body.length
    gzip += gzipSync(body).length
  }
  return { files: srcs.size, raw, gzip }
}

const ms = (v: number) => `${v.toFixed(1).padStart(7)} ms`
const kb = (v: number) => `${(v / 1024).toFixed(1).padStart(7)} KiB`

export async function run(): Promise<void> {
  // The scheduled pipeline is off: its own cost is in the pipeline benchmark; here the server
  // serves the overview while it stores samples, and tag_status rows stand in for its results.
  const stack = await startStack({ NUXT_PIPELINE_SCHEDULED: 'false' })
  try {
    const codes = (await addTags(stack)).map(t => t.code)
    const cookie = await signIn(stack.url)
    const idle = await timeOverview(stack.url, cookie)
    const ingest = startIngest(stack.url, codes)
    const busy = await timeOverview(stack.url, cookie)
    const ingestRate = await ingest.stop()
    const overviewJs = await pageScripts(stack.url, '/', cookie)
    const tagJs = await pageScripts(stack.url, '/tags/1', cookie)
    console.log(`GET /api/overview, ${TAGS} tags, ${REQUESTS} sequential requests after ${WARMUP} warm-up`)
    console.log(`                       p50          p95          max`)
    console.log(`idle server      ${ms(idle.p50)}   ${ms(idle.p95)}   ${ms(idle.max)}`)
    console.log(`during ingest    ${ms(busy.p50)}   ${ms(busy.p95)}   ${ms(busy.max)}   (${INGEST_WORKERS} gateways, ${ingestRate.toLocaleString('en')} samples/s stored)`)
    console.log(`goal p95 < 100 ms during ingest: ${busy.p95 < 100 ? 'met' : 'NOT met'}`)
    console.log(`page JavaScript on first load        files       raw         gzip`)
    console.log(`overview  (/)                        ${String(overviewJs.files).padStart(5)}   ${kb(overviewJs.raw)}  ${kb(overviewJs.gzip)}`)
    console.log(`tag detail (/tags/1, with uPlot)     ${String(tagJs.files).padStart(5)}   ${kb(tagJs.raw)}  ${kb(tagJs.gzip)}`)
  }
  finally {
    await stack.stop()
  }
}
