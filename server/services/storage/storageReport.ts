import type { Db } from '../../utils/db'
import { listPartitions } from './partitions'
import { databaseBytes, tableSizes } from './sizes'

const DAY_MS = 86_400_000
/** The snapshots the growth rate is measured over: the last week, at least an hour of them. */
const RATE_SPAN_MS = 7 * DAY_MS
const MIN_RATE_SPAN_MS = 3_600_000
/** How far ahead the page projects the database's size. */
export const PROJECTION_DAYS = [30, 90, 365] as const

export interface GrowthRate { bytesPerDay: number, fromMs: number, toMs: number }

/**
 * Bytes per day between the oldest snapshot of the last week and the newest: the database's net
 * growth (ingest less what retention removed), so the projection is the size it will have if the
 * plant keeps sending as it did. Null until the snapshots span an hour.
 */
export function growthRate(snapshots: { takenAtMs: number, databaseBytes: number }[], nowMs: number): GrowthRate | null {
  const recent = snapshots.filter(s => s.takenAtMs >= nowMs - RATE_SPAN_MS).sort((a, b) => a.takenAtMs - b.takenAtMs)
  const first = recent[0]
  const last = recent[recent.length - 1]
  if (!first || !last || last.takenAtMs - first.takenAtMs < MIN_RATE_SPAN_MS) return null
  const spanMs = last.takenAtMs - first.takenAtMs
  return { bytesPerDay: (last.databaseBytes - first.databaseBytes) / (spanMs / DAY_MS), fromMs: first.takenAtMs, toMs: last.takenAtMs }
}

/** The admin's storage page: sizes now, per-site raw windows, snapshots and the projection. */
export async function readStorageReport(db: Db, nowMs = Date.now()) {
  const [tables, bytes, dayPartitions, sites, snapshots] = await Promise.all([
    tableSizes(db),
    databaseBytes(db),
    listPartitions(db, 'samples'),
    db.$sql<{ id: number, code: string, name: string, timeZone: string, rawRetentionDays: number | null }[]>`
      select id, code, name, time_zone as "timeZone", raw_retention_days as "rawRetentionDays" from sites where retired_at is null order by code`,
    db.$sql<{ takenAtMs: number, databaseBytes: string, sampleRows: string, archiveRows: string }[]>`
      select extract(epoch from taken_at)::float8 * 1000 as "takenAtMs", database_bytes as "databaseBytes", sample_rows as "sampleRows", archive_rows as "archiveRows"
      from storage_snapshots where taken_at >= ${new Date(nowMs - 90 * DAY_MS).toISOString()}::timestamptz order by taken_at`,
  ])
  const history = snapshots.map(s => ({
    takenAtMs: Number(s.takenAtMs), databaseBytes: Number(s.databaseBytes), sampleRows: Number(s.sampleRows),
    archiveRows: Number(s.archiveRows),
  }))
  const samples = tables.find(t => t.name === 'samples') ?? { name: 'samples', bytes: 0, rows: 0 }
  const archive = tables.find(t => t.name === 'samples_minute') ?? { name: 'samples_minute', bytes: 0, rows: 0 }
  const rate = growthRate(history, nowMs)
  return {
    takenAt: new Date(nowMs).toISOString(),
    databaseBytes: bytes,
    samples: {
      rows: samples.rows, bytes: samples.bytes,
      bytesPerSample: samples.rows > 0 ? samples.bytes / samples.rows : null,
      dayPartitions: dayPartitions.length,
      oldestDay: dayPartitions[0] ? new Date(dayPartitions[0].fromMs).toISOString().slice(0, 10) : null,
    },
    archive: { rows: archive.rows, bytes: archive.bytes, bytesPerRow: archive.rows > 0 ? archive.bytes / archive.rows : null },
    tables,
    sites,
    snapshots: history.map(({ takenAtMs, ...s }) => ({ ...s, takenAt: new Date(takenAtMs).toISOString() })),
    growth: rate && {
      bytesPerDay: rate.bytesPerDay,
      from: new Date(rate.fromMs).toISOString(),
      to: new Date(rate.toMs).toISOString(),
      projected: PROJECTION_DAYS.map(days => ({ days, bytes: Math.max(0, bytes + rate.bytesPerDay * days) })),
    },
  }
}
