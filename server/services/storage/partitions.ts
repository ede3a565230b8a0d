import type { Db } from '../../utils/db'

// Sample storage is partitioned by time (migration 0020): samples by UTC day, the per-minute
// archive by UTC month, each with a default partition that catches rows no partition covers yet.
// brinkline_ensure_partition (SQL) makes one; this file is the one place that names them.

const DAY_MS = 86_400_000
/** Day partitions made ahead of the clock, so live ingest never waits on a CREATE TABLE. */
export const DAYS_AHEAD = 3

export type PartitionedTable = 'samples' | 'samples_minute'

export interface Partition { name: string, fromMs: number, toMs: number }

const NAME = /^(samples|samples_minute)_p(\d{4})(\d{2})(\d{2})?$/

/** The range a partition's name stands for, or undefined for the default and foreign tables. */
export function partitionRange(name: string): Partition | undefined {
  const m = NAME.exec(name)
  if (!m) return undefined
  const [year, month, day] = [Number(m[2]), Number(m[3]) - 1, m[4] ? Number(m[4]) : undefined]
  const fromMs = Date.UTC(year, month, day ?? 1)
  const toMs = day === undefined ? Date.UTC(year, month + 1, 1) : Date.UTC(year, month, day + 1)
  return { name, fromMs, toMs }
}

/** The partitions of a table with their ranges, oldest first (the default partition left out). */
export async function listPartitions(db: Db, table: PartitionedTable): Promise<Partition[]> {
  const rows = await db.$sql<{ name: string }[]>`
    select c.relname as name from pg_inherits i join pg_class c on c.oid = i.inhrelid
    where i.inhparent = ${table}::regclass`
  return rows.flatMap(r => partitionRange(r.name) ?? []).sort((a, b) => a.fromMs - b.fromMs)
}

// Days this process knows to have a partition: the live path asks the database once per day.
// A day partition dropped by retention stays in another process's set; its late rows then land
// in the default partition, and the storage job moves them into a partition made again.
const knownDays = new Set<number>()

/**
 * Makes sure the day partitions for these sample times exist, each in its own short transaction
 * before the caller's insert (making one inside the insert's transaction would hold the table's
 * lock until that commits, and two inserts doing so would deadlock).
 */
export async function ensureSamplePartitions(db: Db, timesMs: Iterable<number>): Promise<void> {
  const missing = [...new Set(Array.from(timesMs, t => Math.floor(t / DAY_MS)))].filter(d => !knownDays.has(d))
  for (const day of missing) {
    await db.$sql`select brinkline_ensure_partition('samples', ${new Date(day * DAY_MS).toISOString()}::timestamptz)`
    knownDays.add(day)
  }
}

/** Forgets a day this process dropped, so its next sample asks for the partition again. */
export function forgetSampleDay(fromMs: number): void {
  knownDays.delete(Math.floor(fromMs / DAY_MS))
}

/** The days from today through DAYS_AHEAD, and the archive's current and next month. */
export async function ensureUpcomingPartitions(db: Db, nowMs: number): Promise<void> {
  await ensureSamplePartitions(db, Array.from({ length: DAYS_AHEAD + 1 }, (_, i) => nowMs + i * DAY_MS))
  const now = new Date(nowMs)
  for (const at of [now, new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() + 1, 1))]) {
    await db.$sql`select brinkline_ensure_partition('samples_minute', ${at.toISOString()}::timestamptz)`
  }
}

/**
 * Moves rows the default partition holds into day partitions (made for them): rows written by
 * a process whose known day had been dropped, or inserted past the partitions made ahead. Rows
 * beyond the accepted sample horizon stay where they are.
 */
export async function relocateDefaultRows(db: Db, nowMs: number): Promise<number> {
  // Epoch milliseconds, not timestamps: the shared client leaves timestamps as text (drizzle's parsers).
  const days = await db.$sql<{ dayMs: number }[]>`
    select distinct extract(epoch from date_trunc('day', time at time zone 'UTC'))::float8 * 1000 as "dayMs" from samples_default
    where time >= '2000-01-01T00:00:00Z' and time < ${new Date(nowMs + (DAYS_AHEAD + 1) * DAY_MS).toISOString()}::timestamptz`
  for (const { dayMs } of days) {
    await db.$sql`select brinkline_ensure_partition('samples', ${new Date(dayMs).toISOString()}::timestamptz)`
    knownDays.add(Math.floor(dayMs / DAY_MS))
  }
  return days.length
}
