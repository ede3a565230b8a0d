import { alarmRuleListQuerySchema } from '#shared/schemas/alarmRule'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const filters = await validQuery(event, alarmRuleListQuerySchema)
  return listRules(useDb(), filters)
})
