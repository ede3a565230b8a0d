import { idParamsSchema } from '#shared/schemas/fields'
import { readTagSettings } from '../../../services/indicatorSettings/settings'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const settings = await readTagSettings(useDb(), id)
  if (!settings) throw createError({ statusCode: 404, message: `Tag ${id} not found` })
  return settings
})
