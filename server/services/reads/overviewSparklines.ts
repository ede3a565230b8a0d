import type { Db } from '../../utils/db'
// Sparklines of every watched tag, refreshed at most every few seconds and served from memory.
// Reading the newest samples of 1,000 tags touches ~100,000 scattered rows (tens of ms); doing
// that on every poll of every open overview would dominate its latency. A tile's sparkline a few
// seconds old is invisible at a glance; its live value and status are read fresh on every request.

// Newest SPARK_SAMPLES samples averaged in groups of SPARK_GROUP: every tile draws the same
// number of points on its own time scale.
const SPARK_SAMPLES = 96
const SPARK_GROUP = 3
const REFRESH_MS = 5_000

let cached: { at: number, byTag: Map<number, number[]> } | undefined
let refreshing: Promise<void> | undefined

async function readSparklines(db: Db): Promise<Map<number, number[]>> {
  const rows = await db.$sql<{ id: number, spark: number[] | null }[]>`
    select t.id, spark.values as spark from tags t
    left join lateral (
      select array_agg(g.v order by g.k desc) as values from (
        select r.k, avg(r.value) as v from (
          select s.value, (row_number() over (order by s.time desc) - 1) / ${SPARK_GROUP} as k
          from samples s where s.tag_id = t.id order by s.time desc limit ${SPARK_SAMPLES}
        ) r group by r.k
      ) g
    ) spark on true
    where t.watched`
  // Four significant digits draw the same 28-pixel line and keep the answer small.
  return new Map(rows.map(r => [r.id, (r.spark ?? []).map(v => Number(Number(v).toPrecision(4)))]))
}

function refresh(db: Db): Promise<void> {
  refreshing ??= readSparklines(db)
    .then((byTag) => { cached = { at: Date.now(), byTag } })
    .finally(() => { refreshing = undefined })
  return refreshing
}

/** Sparklines by tag id: waits only for the very first read, then refreshes in the background. */
export async function overviewSparklines(db: Db): Promise<Map<number, number[]>> {
  if (!cached) await refresh(db)
  else if (Date.now() - cached.at > REFRESH_MS) refresh(db).catch(err => console.error('[overview:sparklines]', err))
  return cached!.byTag
}
