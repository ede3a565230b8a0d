import type { Db } from '../../utils/db'

// Sizes as PostgreSQL reports them: bytes on disk (tables with their indexes and TOAST) and rows.
// A small table (under EXACT_BELOW rows by the planner, or never analysed) is counted exactly:
// the count is cheap there, and the planner's reltuples (as of the last ANALYZE, which
// autovacuum skips until 50 rows + 10 % change) could read 0 for hours. The cumulative
// statistics (n_live_tup) are no cure: a delete of rows they never saw counted (after a crash
// or a restore) clamps them at 0 and they then read high. Big tables and the sample partitions
// use reltuples, which the storage job refreshes (analyzeRecentPartitions); a partition never
// analysed is counted by that job, which owns the partitions; a request, under the app role,
// may not read a partition directly and counts it 0.

export interface TableSize { name: string, bytes: number, rows: number }

const EXACT_BELOW = 100_000

/** Every table of the schema, each partitioned table with its partitions summed under its name. */
export async function tableSizes(db: Db, options: { countUnanalysed?: boolean } = {}): Promise<TableSize[]> {
  const rows = await db.$sql<{ name: string, relname: string, bytes: string, estimate: number, partition: boolean }[]>`
    select coalesce(parent.relname, c.relname) as name, c.relname, pg_total_relation_size(c.oid)::bigint as bytes,
      c.reltuples::float8 as estimate, parent.oid is not null as partition
    from pg_class c join pg_namespace n on n.oid = c.relnamespace
    left join pg_inherits i on i.inhrelid = c.oid left join pg_class parent on parent.oid = i.inhparent
    where n.nspname = 'public' and c.relkind = 'r'`
  const byName = new Map<string, TableSize>()
  for (const r of rows) {
    const countable = r.partition ? r.estimate < 0 && options.countUnanalysed : r.estimate < EXACT_BELOW
    const rowsOf = countable ? await exactCount(db, r.relname) : Math.max(r.estimate, 0)
    const entry = byName.get(r.name) ?? { name: r.name, bytes: 0, rows: 0 }
    entry.bytes += Number(r.bytes)
    entry.rows += Math.round(rowsOf)
    byName.set(r.name, entry)
  }
  return [...byName.values()].sort((a, b) => b.bytes - a.bytes)
}

async function exactCount(db: Db, relname: string): Promise<number> {
  const [row] = await db.$sql<{ n: number }[]>`select count(*)::float8 as n from ${db.$sql(relname)}`
  return row?.n ?? 0
}

export async function databaseBytes(db: Db): Promise<number> {
  const [row] = await db.$sql<{ bytes: string }[]>`select pg_database_size(current_database())::bigint as bytes`
  return Number(row!.bytes)
}

/**
 * Refreshes the statistics of the sample partitions that change (today's and yesterday's) and of
 * any never analysed, so row counts and bytes per sample stay current between autovacuum runs.
 */
export async function analyzeRecentPartitions(db: Db, names: { name: string, fromMs: number }[], nowMs: number): Promise<void> {
  const never = new Set((await db.$sql<{ relname: string }[]>`
    select c.relname from pg_class c join pg_inherits i on i.inhrelid = c.oid
    where i.inhparent in ('samples'::regclass, 'samples_minute'::regclass) and c.reltuples < 0`).map(r => r.relname))
  for (const p of names) {
    if (never.has(p.name) || p.fromMs >= nowMs - 2 * 86_400_000) await db.$sql`analyze ${db.$sql(p.name)}`
  }
  for (const name of never) if (!names.some(p => p.name === name)) await db.$sql`analyze ${db.$sql(name)}`
}
