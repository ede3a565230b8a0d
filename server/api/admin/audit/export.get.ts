import { auditQuerySchema } from '#shared/schemas/audit'
import { auditCsv } from '#shared/utils/auditCsv'

// The audit log as CSV, with the same filters as the page (up to 50,000 records a file).
const EXPORT_LIMIT = 50_000

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const query = await validQuery(event, auditQuerySchema.innerType().omit({ limit: true }))
  const db = useDb()
  const rows = await listAudit(db, { ...query, limit: EXPORT_LIMIT })
  await writeAudit(db, { userId: user.id, action: 'audit.export', detail: { filters: query, rows: rows.length }, address: clientAddress(event) })
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="brinkline-audit-${new Date().toISOString().slice(0, 10)}.csv"`)
  return auditCsv(rows.map(r => ({ ...r, at: r.at.toISOString() })))
})
