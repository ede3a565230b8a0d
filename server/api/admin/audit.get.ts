import { z } from 'zod'

const auditQuerySchema = z.object({ limit: z.coerce.number().int().min(1).max(1000).default(200) })

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { limit } = await validQuery(event, auditQuerySchema)
  return listAudit(useDb(), limit)
})
