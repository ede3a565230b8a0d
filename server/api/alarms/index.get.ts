import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { alarmListQuerySchema } from '#shared/schemas/alarm'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const filters = await validQuery(event, alarmListQuerySchema)
  return { advisory: ADVISORY_CAUTION, alarms: await listAlarms(useDb(), filters) }
})
