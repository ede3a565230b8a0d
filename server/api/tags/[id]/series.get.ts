import { idParamsSchema } from '#shared/schemas/fields'
import { seriesQuerySchema } from '#shared/schemas/series'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, idParamsSchema)
  const { range } = await validQuery(event, seriesQuerySchema)
  const series = await readTagSeries(useDb(), id, range)
  if (!series) throw createError({ statusCode: 404, message: `Tag ${id} not found` })
  return series
})
