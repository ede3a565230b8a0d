import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { healthQuerySchema } from '#shared/schemas/review'

// Alarm-system health: any signed-in role may read it (docs/design.md §D2.1, view).
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const query = await validQuery(event, healthQuerySchema)
  const health = await alarmHealthReport(useDb(), query).catch((err) => { throw reviewHttpError(err) })
  return { advisory: ADVISORY_CAUTION, ...health }
})
