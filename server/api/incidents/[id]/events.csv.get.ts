import { idParamsSchema } from '#shared/schemas/fields'
import { incidentEventsCsv } from '#shared/utils/incidentEventsCsv'

// The incident's alarm events and shift-log notes as CSV, for any signed-in role.
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, idParamsSchema)
  const timeline = await incidentTimeline(useDb(), id, { series: false })
  if (!timeline) throw createError({ statusCode: 404, message: `id: incident ${id} does not exist` })
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="brinkline-incident-${id}-events.csv"`)
  return incidentEventsCsv(timeline.entries, timeline.incident.timeZone)
})
