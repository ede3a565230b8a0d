import { z } from 'zod'

/** Largest batch one request may carry; gateways split bigger backlogs. */
export const MAX_BATCH_SAMPLES = 10_000
/** Largest request body (bytes) — ample for MAX_BATCH_SAMPLES samples of JSON. */
export const MAX_INGEST_BYTES = 4 * 1024 * 1024

// The envelope only: each sample is checked on its own (shared/utils/sampleBatch.ts) so that one
// bad reading is rejected with its index instead of failing the batch.
export const ingestBatchSchema = z.object({
  samples: z.array(z.unknown(), { required_error: 'is required (an array of {tag, time, value, quality?})' })
    .min(1, 'must hold at least one sample'),
})
