import { idParamsSchema } from '#shared/schemas/fields'
import { retentionUpdateSchema } from '#shared/schemas/storage'
import { setSiteRetention } from '../../../../services/storage/siteRetention'

// A shorter window removes raw samples at the next storage run (folded into the per-minute
// archive first), so the change is audited with the window before and after.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const { rawRetentionDays } = await validBody(event, retentionUpdateSchema)
  return useDb().transaction(async (tx) => {
    const changed = await setSiteRetention(tx, id, rawRetentionDays)
    if (!changed) throw createError({ statusCode: 404, message: `id: site ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'site.retention', target: changed.code, detail: { id, before: changed.before, after: changed.after }, address: clientAddress(event) })
    return { id, rawRetentionDays: changed.after }
  })
})
