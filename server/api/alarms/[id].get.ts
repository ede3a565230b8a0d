import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { alarmIdParamsSchema } from '#shared/schemas/alarm'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, alarmIdParamsSchema)
  const alarm = await getAlarmWithEvents(useDb(), id)
  if (!alarm) throw createError({ statusCode: 404, message: `Alarm ${id} not found` })
  return { ...alarm, advisory: ADVISORY_CAUTION }
})
