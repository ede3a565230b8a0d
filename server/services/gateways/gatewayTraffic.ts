import { asc, gte } from 'drizzle-orm'
import { gatewayHourly } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'

export interface HourCounts { hour: string, accepted: number, duplicates: number, rejected: number, failedBatches: number }

/**
 * Per gateway, the last `hours` clock hours of ingest counters, oldest first, with empty hours
 * filled in as zeros so a chart shows gaps as gaps, not as a straight line across them.
 */
export async function gatewayTraffic(db: DbExecutor, hours = 24, now = new Date()): Promise<Map<number, HourCounts[]>> {
  const end = new Date(now)
  end.setUTCMinutes(0, 0, 0)
  const start = new Date(end.getTime() - (hours - 1) * 3_600_000)
  const rows = await db.select({
    gatewayId: gatewayHourly.gatewayId, hour: gatewayHourly.hour,
    accepted: gatewayHourly.acceptedCount, duplicates: gatewayHourly.duplicateCount,
    rejected: gatewayHourly.rejectedCount, failedBatches: gatewayHourly.failedBatchCount,
  }).from(gatewayHourly).where(gte(gatewayHourly.hour, start)).orderBy(asc(gatewayHourly.hour))
  const byGateway = new Map<number, HourCounts[]>()
  for (const r of rows) {
    const series = byGateway.get(r.gatewayId) ?? emptyHours(start, hours)
    const slot = series[Math.round((r.hour.getTime() - start.getTime()) / 3_600_000)]
    if (slot) Object.assign(slot, { accepted: r.accepted, duplicates: r.duplicates, rejected: r.rejected, failedBatches: r.failedBatches })
    byGateway.set(r.gatewayId, series)
  }
  return byGateway
}

const emptyHours = (start: Date, hours: number): HourCounts[] => Array.from({ length: hours }, (_, i) => ({
  hour: new Date(start.getTime() + i * 3_600_000).toISOString(), accepted: 0, duplicates: 0, rejected: 0, failedBatches: 0,
}))
