import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { idParamsSchema } from '#shared/schemas/fields'
import { incidentTimelineQuerySchema } from '#shared/schemas/incident'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, idParamsSchema)
  const { tags } = await validQuery(event, incidentTimelineQuerySchema)
  const timeline = await incidentTimeline(useDb(), id, { tags }).catch((err) => { throw reviewHttpError(err) })
  if (!timeline) throw createError({ statusCode: 404, message: `id: incident ${id} does not exist` })
  return { advisory: ADVISORY_CAUTION, ...timeline }
})
