import { idParamsSchema } from '#shared/schemas/fields'
import { indicatorSettingsSaveSchema } from '#shared/schemas/indicatorSettings'
import { saveTagSettings } from '../../../services/indicatorSettings/settings'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const { settings, reason } = await validBody(event, indicatorSettingsSaveSchema)
  return useDb().transaction(async (tx) => {
    const saved = await saveTagSettings(tx, id, settings, reason, user.id)
    if (!saved) throw createError({ statusCode: 404, message: `Tag ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'indicator_settings.update', target: `tag ${id}`, detail: { id, versionId: saved.versionId, reason, changed: saved.changed }, address: clientAddress(event) })
    return saved
  })
})
