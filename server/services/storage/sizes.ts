import type { Db } from '../../utils/db'

// Sizes as PostgreSQL reports them: bytes on disk (tables with their indexes and TOAST), rows
// from the planner's statistics (reltuples, kept by ANALYZE and autovacuum). A table never
// analysed yet (a new, so a small one) is counted exactly by the storage job, which owns the
// partitions; a request, under the app role, may not read a partition directly and counts it 0.

export interface TableSize { name: string, bytes: number, rows: number }

/** Every table of the schema, each partitioned table with its partitions summed under its name. */
export async function tableSizes(db: Db, options: { countUnanalysed?: boolean } = {}): Promise<TableSize[]> {
  const rows = await db.$sql<{ name: string, relname: string, bytes: string, estimate: number }[]>`
    select coalesce(parent.relname, c.relname) as name, c.relname, pg_total_relation_size(c.oid)::bigint as bytes, c.reltuples::float8 as estimate
    from pg_class c join pg_namespace n on n.oid = c.relnamespace
    left join pg_inherits i on i.inhrelid = c.oid left join pg_class parent on parent.oid = i.inhparent
    where n.nspname = 'public' and c.relkind = 'r'`
  const byName = new Map<string, TableSize>()
  for (const r of rows) {
    const rowsOf = r.estimate >= 0 ? r.estimate : options.countUnanalysed ? await exactCount(db, r.relname) : 0
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
