import { useRuntimeConfig } from 'nitropack/runtime'
import { MAX_FUTURE_SKEW_MS, type SampleClock } from '#shared/utils/sampleBatch'
import { rawWindowStartMs } from '#shared/utils/rawWindow'
import type { Db } from '../../utils/db'

/**
 * The receiving clock and its skew allowance (runtimeConfig ingest.maxFutureSkewS, env
 * NUXT_INGEST_MAX_FUTURE_SKEW_S). One setting for every path that takes samples in — gateways,
 * OPC UA, CSV files — and for the pipeline, which never reads past the same horizon.
 */
export function sampleClock(nowMs = Date.now()): Required<Pick<SampleClock, 'nowMs' | 'maxFutureMs'>> {
  const configured = Number(useRuntimeConfig().ingest?.maxFutureSkewS)
  const maxFutureMs = Number.isFinite(configured) && configured >= 0 ? configured * 1000 : MAX_FUTURE_SKEW_MS
  return { nowMs, maxFutureMs }
}

/** The clock for samples of one site: also refuses times before the site's raw window. */
export async function siteSampleClock(db: Db, siteId: number, nowMs = Date.now()): Promise<SampleClock> {
  const clock = sampleClock(nowMs)
  const [site] = await db.$sql<{ days: number | null }[]>`select raw_retention_days as days from sites where id = ${siteId}`
  return site?.days == null ? clock : { ...clock, rawFromMs: rawWindowStartMs(nowMs, site.days) }
}
