import type { Db } from '../../utils/db'
import { ensureUpcomingPartitions, listPartitions, relocateDefaultRows } from './partitions'
import { applyRetention, type RetentionReport } from './retention'
import { analyzeRecentPartitions, databaseBytes, tableSizes } from './sizes'

export interface MaintenanceReport extends RetentionReport {
  /** Days the default partition held rows for, now in day partitions of their own. */
  relocatedDays: number
  databaseBytes: number
}

/**
 * The storage job (task storage:maintain, hourly): partitions ahead of the clock, rows of the
 * default partition into day partitions, each site's raw window applied, statistics refreshed and
 * a size snapshot for the growth chart. Every step is idempotent, so a run cut short is simply
 * finished by the next one.
 */
export async function runStorageMaintenance(db: Db, nowMs = Date.now()): Promise<MaintenanceReport> {
  await ensureUpcomingPartitions(db, nowMs)
  const relocatedDays = await relocateDefaultRows(db, nowMs)
  const retention = await applyRetention(db, nowMs)
  await analyzeRecentPartitions(db, [...await listPartitions(db, 'samples'), ...await listPartitions(db, 'samples_minute')], nowMs)
  const sizes = await tableSizes(db, { countUnanalysed: true })
  const rowsOf = (name: string) => sizes.find(t => t.name === name)?.rows ?? 0
  const bytes = await databaseBytes(db)
  await db.$sql`insert into storage_snapshots (taken_at, database_bytes, sample_rows, archive_rows)
    values (${new Date(nowMs).toISOString()}::timestamptz, ${bytes}, ${rowsOf('samples')}, ${rowsOf('samples_minute')})`
  return { ...retention, relocatedDays, databaseBytes: bytes }
}
