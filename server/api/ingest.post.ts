import { ingestBatchSchema, MAX_BATCH_SAMPLES, MAX_INGEST_BYTES } from '#shared/schemas/ingest'
import { ingestBatch } from '../services/ingest/ingestBatch'

export default defineEventHandler(async (event) => {
  const gateway = await requireGateway(event)
  await requireIngestBudget(event, gateway.id)
  const db = useDb()
  try {
    const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
    if (declared > MAX_INGEST_BYTES) tooLarge(`body of ${declared} bytes exceeds the limit of ${MAX_INGEST_BYTES}`)
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
