import { idParamsSchema } from '#shared/schemas/fields'
import { indicatorSettingsPreviewSchema } from '#shared/schemas/indicatorSettings'
import { previewTagSettings } from '../../../../services/indicatorSettings/preview'

// A POST because the proposed settings travel as a JSON body; nothing is stored.
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const { settings, range } = await validBody(event, indicatorSettingsPreviewSchema)
  const preview = await previewTagSettings(useDb(), id, settings, range)
  if (!preview) throw createError({ statusCode: 404, message: `Tag ${id} not found` })
  return preview
})
