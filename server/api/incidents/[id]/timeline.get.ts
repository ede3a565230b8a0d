import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { idParamsSchema } from '#shared/schemas/fields'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, idParamsSchema)
  const timeline = await incidentTimeline(useDb(), id)
  if (!timeline) throw createError({ statusCode: 404, message: `id: incident ${id} does not exist` })
  return { advisory: ADVISORY_CAUTION, ...timeline }
})
