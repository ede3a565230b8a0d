import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { idParamsSchema } from '#shared/schemas/fields'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, idParamsSchema)
  const alarm = await getAlarmWithEvents(useDb(), id)
  if (!alarm) throw createError({ statusCode: 404, message: `Alarm ${id} not found` })
  return { ...alarm, advisory: ADVISORY_CAUTION }
})
