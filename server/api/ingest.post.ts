import { ingestBatchSchema, MAX_BATCH_SAMPLES } from '#shared/schemas/ingest'
import { ingestBatch } from '../services/ingest/ingestBatch'

export default defineEventHandler(async (event) => {
  const gateway = await requireGateway(event)
  await requireIngestBudget(event, gateway.id)
  const db = useDb()
  try {
    // The body stops at MAX_INGEST_BYTES while it is read (middleware/bodyLimits.ts): a 413 from
    // there lands in the catch below like any refused batch, before anything is stored.
    const { samples: items } = await validBody(event, ingestBatchSchema)
    if (items.length > MAX_BATCH_SAMPLES) tooLarge(`batch of ${items.length} samples exceeds the limit of ${MAX_BATCH_SAMPLES}; split it`)
    return await ingestBatch(db, {
      siteId: gateway.siteId,
      items,
      countAgainstSource: (tx, counts) => countGatewayBatch(tx, gateway.id, counts),
    })
  }
  catch (err) {
    const status = (err as { statusCode?: number }).statusCode
    if (status && status >= 400 && status < 500) await recordFailedBatch(db, gateway.id, (err as Error).message)
    throw err
  }
})

function tooLarge(message: string): never {
  throw createError({ statusCode: 413, message })
}
