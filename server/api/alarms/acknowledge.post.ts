import { acknowledgeSchema } from '#shared/schemas/alarm'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'respond')
  const input = await validBody(event, acknowledgeSchema)
  return acknowledgeAlarms(useDb(), input, changeContext(user.id)).catch((err) => { throw alarmHttpError(err) })
})
