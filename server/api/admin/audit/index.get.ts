import { auditQuerySchema } from '#shared/schemas/audit'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const query = await validQuery(event, auditQuerySchema)
  return listAudit(useDb(), query)
})
