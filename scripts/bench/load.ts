// Load run (issue 13 item 10): the built server as the product runs it — scheduled pipeline and
// sender on — with 1,000 tags sampled at 1 Hz posted through the ingest API while 20 signed-in
// consoles poll the routes their screens poll, at the screens' own periods, for a bounded time.
// Prints p95 per route, errors, how far the pipeline lags the newest sample, and the bytes each
// stored sample takes on disk. BENCH_LOAD_SECONDS (default 90) and BENCH_LOAD_TAGS (default
// 1,000) shorten or shrink it; docs/scale-out.md reads its numbers.
import { availableParallelism, loadavg } from 'node:os'
import { BENCH_PASSWORD, BENCH_SIM_KEY, startStack, type BenchStack } from './support/stack'

const TAGS = Number(process.env.BENCH_LOAD_TAGS ?? 1_000)
const SECONDS = Number(process.env.BENCH_LOAD_SECONDS ?? 90)
/** Requests in the first seconds (server warming up, first ticks) are not counted. */
const WARMUP_S = 10
/** Samples per tag already stored when the run starts: enough for full indicator windows. */
const HISTORY = 600
/** Tags per ingest request: two gateways' worth of a 1,000-tag plant. */
const GATEWAY_TAGS = 500

/**
 * The console screens that poll, how many of the 20 consoles show each, and their periods as the
 * pages set them (app/pages/index.vue 5 s, alarms/index.vue 5 s with the units list,
 * tags/[id].vue 10 s, units/[id].vue 15 s, review/incidents/index.vue 30 s).
 */
interface Screen { name: string, consoles: number, periodMs: number, role: 'operator' | 'supervisor', paths: (ids: BenchIds) => string[] }
interface BenchIds { tagIds: number[], unitId: number }
const SCREENS: Screen[] = [
  { name: 'overview', consoles: 8, periodMs: 5_000, role: 'operator', paths: () => ['/api/overview'] },
  { name: 'alarm list', consoles: 5, periodMs: 5_000, role: 'operator', paths: () => ['/api/alarms', '/api/units'] },
  { name: 'tag chart', consoles: 4, periodMs: 10_000, role: 'operator', paths: ids => [`/api/tags/${ids.tagIds[0]}/series`] },
  { name: 'unit slow mode', consoles: 2, periodMs: 15_000, role: 'operator', paths: ids => [`/api/units/${ids.unitId}/slow-mode`] },
  { name: 'incident list', consoles: 1, periodMs: 30_000, role: 'supervisor', paths: () => ['/api/incidents'] },
]

/** Response times and failures per route, counted after the warm-up. */
class RouteStats {
  private readonly byRoute = new Map<string, { ms: number[], failures: Map<string, number>, bytes: number }>()
  constructor(private readonly countFrom: number) {}
  /** `status` 0: no answer (connection refused or reset). */
  record(route: string, startedAt: number, ms: number, status: number, bytes = 0) {
    if (startedAt < this.countFrom) return
    const entry = this.byRoute.get(route) ?? { ms: [], failures: new Map<string, number>(), bytes: 0 }
    entry.ms.push(ms)
    entry.bytes += bytes
    if (status !== 200) entry.failures.set(String(status || 'no answer'), (entry.failures.get(String(status || 'no answer')) ?? 0) + 1)
    this.byRoute.set(route, entry)
  }

  rows() {
    return [...this.byRoute].map(([route, { ms, failures, bytes }]) => {
      const sorted = [...ms].sort((a, b) => a - b)
      const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)] ?? 0
      const errors = [...failures.values()].reduce((n, k) => n + k, 0)
      const byStatus = [...failures].map(([status, n]) => `${n}× ${status}`).join(', ')
      return {
        route, requests: ms.length, errors, byStatus, p50: at(0.5), p95: at(0.95), max: sorted.at(-1) ?? 0, kib: bytes / ms.length / 1024
      }
    })
  }
}

async function addLoadTags(stack: BenchStack): Promise<BenchIds & { codes: string[] }> {
  const { sql } = stack
  const [unit] = await sql`insert into units (site_id, code, name, kind) select id, 'LOAD', 'Load-run unit', 'bench' from sites order by id limit 1 returning id, site_id`
  // Unwatched while the history goes in, so no tick processes it as new samples.
  const tags = await sql<{ id: number, code: string }[]>`
    insert into tags (site_id, unit_id, code, description, engineering_unit, sample_period_s, range_low, range_high, watched)
    select ${unit!.site_id}, ${unit!.id}, 'LI-' || (5000 + g), 'Load-run signal ' || g, 'K', 1, 0, 100, false
    from generate_series(1, ${TAGS}) g returning id, code`
  const ids = tags.map(t => t.id)
  const end = Math.floor(Date.now() / 1000) * 1000
  await sql`insert into samples (tag_id, time, value, quality)
    select t, to_timestamp((${end}::float8 - 1000 * i) / 1000.0), 50 + 5 * sin(i / 10.0) + random(), 0
    from unnest(${ids}::int[]) t, generate_series(1, ${HISTORY}) i`
  // Claims at the end of the history, staggered as a running pipeline leaves them.
  await sql`insert into tag_analysis_state (tag_id, last_sample_time, samples_since_evaluation)
    select t, to_timestamp((${end}::float8 - 1000) / 1000.0), t % 20 from unnest(${ids}::int[]) t
    on conflict (tag_id) do update set last_sample_time = excluded.last_sample_time, samples_since_evaluation = excluded.samples_since_evaluation`
  await sql`update tags set watched = true where id = any(${ids})`
  await sql`analyze`
  return { tagIds: ids, unitId: unit!.id, codes: tags.map(t => t.code) }
}

async function signIn(url: string, role: string): Promise<string> {
  const res = await fetch(`${url}/api/public/sign-in`, {
    method: 'POST', headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: `${role}@harrowgate.example`, password: BENCH_PASSWORD }),
  })
  if (res.status !== 200) throw new Error(`sign-in as ${role} answered ${res.status}`)
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

/** Samples the disk holds for the samples table (partitions included) and its rows. */
async function sampleStorage(stack: BenchStack) {
  const [row] = await stack.sql<{ bytes: string, rows: string }[]>`
    select case when c.relkind = 'p' then (select sum(pg_total_relation_size(relid)) from pg_partition_tree(c.oid))
      else pg_total_relation_size(c.oid) end as bytes, (select count(*) from samples) as rows
    from pg_class c where c.oid = 'samples'::regclass`
  return { bytes: Number(row!.bytes), rows: Number(row!.rows) }
}

const sleep = (ms: number) => new Promise(resolve => setTimeout(resolve, ms))

export async function run(): Promise<void> {
  const stack = await startStack()
  try {
    const ids = await addLoadTags(stack)
    const cookies = { operator: await signIn(stack.url, 'operator'), supervisor: await signIn(stack.url, 'supervisor') }
    const before = await sampleStorage(stack)
    const started = performance.now()
    const stopAt = started + SECONDS * 1000
    const stats = new RouteStats(started + WARMUP_S * 1000)
    let ingestRejected = 0
    let samplesSent = 0
    const loadBefore = loadavg()[0]!

    const timed = async (route: string, request: () => Promise<Response>) => {
      const t0 = performance.now()
      const res = await request().catch(() => null)
      const body = res ? await res.arrayBuffer().catch(() => new ArrayBuffer(0)) : new ArrayBuffer(0)
      stats.record(route, t0, performance.now() - t0, res?.status ?? 0, body.byteLength)
      return res?.status === 200 ? body : null
    }

    // Gateways: every second, each posts that second's sample of its tags; a gateway that fell
    // behind sends the seconds it owes, each stamped with its own second, as a real one would.
    const firstSecond = Math.ceil(Date.now() / 1000) * 1000
    const gateway = async (codes: string[]) => {
      for (let second = 0; performance.now() < stopAt; second++) {
        const due = started + second * 1000
        if (due > performance.now()) await sleep(due - performance.now())
        const time = firstSecond + second * 1000
        const body = JSON.stringify({ samples: codes.map(tag => ({ tag, time, value: 50 + 5 * Math.sin(time / 10_000) + Math.random() })) })
        samplesSent += codes.length
        const answer = await timed('POST /api/ingest', () => fetch(`${stack.url}/api/ingest`, {
          method: 'POST', headers: { 'authorization': `Bearer ${BENCH_SIM_KEY}`, 'content-type': 'application/json' }, body,
        }))
        if (answer) ingestRejected += (JSON.parse(Buffer.from(answer).toString()) as { rejected: unknown[] }).rejected.length
      }
    }
    const gateways = Array.from(
      { length: Math.ceil(ids.codes.length / GATEWAY_TAGS) },
      (_, g) => gateway(ids.codes.slice(g * GATEWAY_TAGS, (g + 1) * GATEWAY_TAGS))
    )

    // Consoles: each polls its screen's routes at the screen's period, starting at its own offset.
    const consoles = SCREENS.flatMap(screen => Array.from({ length: screen.consoles }, async (_, i) => {
      await sleep((screen.periodMs * i) / screen.consoles)
      while (performance.now() < stopAt) {
        const next = performance.now() + screen.periodMs
        await Promise.all(screen.paths(ids).map(path => timed(`GET ${path.replace(/\/\d+(?=\/|$)/g, '/:id')}`,
          () => fetch(`${stack.url}${path}`, { headers: { cookie: cookies[screen.role] } }))))
        await sleep(Math.max(0, next - performance.now()))
      }
    }))
    // How far each tag's claim trails its newest stored sample, read every 5 s: the pipeline keeps
    // up while this stays within a tick period or two (ticks every 10 s).
    const pipelineLag = () => stack.sql<{ p95: number, max: number }[]>`
      select percentile_cont(0.95) within group (order by lag) as p95, max(lag) as max
      from (select extract(epoch from (select max(time) from samples s where s.tag_id = st.tag_id) - st.last_sample_time)::float8 as lag
            from tag_analysis_state st where st.tag_id = any(${ids.tagIds})) l`.then(rows => rows[0]!)
    const worstLag = { p95: 0, max: 0 }
    const lagMonitor = (async () => {
      while (performance.now() < stopAt) {
        await sleep(5_000)
        const lag = await pipelineLag()
        if (performance.now() > started + WARMUP_S * 1000) {
          worstLag.p95 = Math.max(worstLag.p95, lag.p95 ?? 0)
          worstLag.max = Math.max(worstLag.max, lag.max ?? 0)
        }
      }
    })()
    await Promise.all([...gateways, ...consoles, lagMonitor])
    const elapsedS = (performance.now() - started) / 1000
    const loadAfter = loadavg()[0]!
    // One more tick period, then the lag the run ended with.
    await sleep(10_000)
    const endLag = await pipelineLag()
    const [points] = await stack.sql<{ n: number }[]>`select count(*)::int as n from indicator_points where tag_id = any(${ids.tagIds})`
    const after = await sampleStorage(stack)

    const num = (v: number) => v.toFixed(1).padStart(9)
    console.log(`${TAGS.toLocaleString('en')} tags × 1 Hz through POST /api/ingest (${gateways.length} gateways), ${SCREENS.reduce((n, s) => n + s.consoles, 0)} polling consoles, ${Math.round(elapsedS)} s (first ${WARMUP_S} s not counted); scheduled pipeline and sender on`)
    console.log(`route                               requests   errors       p50 ms       p95 ms       max ms   KiB/answer`)
    for (const r of stats.rows().sort((a, b) => a.route.localeCompare(b.route)))
      console.log(`${r.route.padEnd(34)} ${String(r.requests).padStart(9)} ${String(r.errors).padStart(8)} ${num(r.p50)}    ${num(r.p95)}    ${num(r.max)}    ${num(r.kib)}${r.byStatus ? `   (${r.byStatus})` : ''}`)
    console.log(`ingest: ${samplesSent.toLocaleString('en')} samples sent, ${(after.rows - before.rows).toLocaleString('en')} stored, ${ingestRejected} rejected`)
    console.log(`pipeline: claim behind its tag's newest sample, worst during the run p95 ${worstLag.p95.toFixed(0)} s / max ${worstLag.max.toFixed(0)} s; `
      + `one tick after the run p95 ${(endLag.p95 ?? 0).toFixed(0)} s; ${points!.n.toLocaleString('en')} indicator points stored for the load-run tags`)
    console.log(`machine: 1-minute load average ${loadBefore.toFixed(1)} at the start, ${loadAfter.toFixed(1)} at the end, on ${availableParallelism()} cores (other work on the machine counts in it)`)
    const grown = after.rows - before.rows
    console.log(`storage: ${(after.bytes / after.rows).toFixed(1)} bytes per sample over the whole samples table (${after.rows.toLocaleString('en')} rows, ${(after.bytes / 2 ** 20).toFixed(1)} MiB, indexes included); `
      + `${grown > 0 ? ((after.bytes - before.bytes) / grown).toFixed(1) : 'n/a'} bytes per sample added in the run`)
    const perDay = grown > 0 ? ((after.bytes - before.bytes) / grown) * TAGS * 86_400 / 2 ** 30 : 0
    console.log(`          at that rate ${TAGS.toLocaleString('en')} tags × 1 Hz grow the table by ${perDay.toFixed(1)} GiB a day`)
  }
  finally {
    await stack.stop()
  }
}
