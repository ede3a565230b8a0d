import { MAX_FUTURE_SKEW_MS, type SampleClock } from '#shared/utils/sampleBatch'

/**
 * The receiving clock and its skew allowance (runtimeConfig ingest.maxFutureSkewS, env
 * NUXT_INGEST_MAX_FUTURE_SKEW_S). One setting for every path that takes samples in — gateways,
 * OPC UA, CSV files — and for the pipeline, which never reads past the same horizon.
 */
export function sampleClock(nowMs = Date.now()): Required<SampleClock> {
  const configured = Number(useRuntimeConfig().ingest?.maxFutureSkewS)
  const maxFutureMs = Number.isFinite(configured) && configured >= 0 ? configured * 1000 : MAX_FUTURE_SKEW_MS
  return { nowMs, maxFutureMs }
}
