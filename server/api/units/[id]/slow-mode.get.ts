import { idParamsSchema } from '#shared/schemas/fields'
import { slowModeQuerySchema } from '#shared/schemas/series'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, idParamsSchema)
  const { range } = await validQuery(event, slowModeQuerySchema)
  const result = await readUnitSlowMode(useDb(), id, range)
  if (!result) throw createError({ statusCode: 404, message: `Unit ${id} not found` })
  return result
})
