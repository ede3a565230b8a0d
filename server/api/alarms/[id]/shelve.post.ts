import { shelveSchema } from '#shared/schemas/alarm'
import { idParamsSchema } from '#shared/schemas/fields'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'respond')
  const { id } = await validParams(event, idParamsSchema)
  const input = await validBody(event, shelveSchema)
  return shelveAlarm(useDb(), id, input, changeContext(user.id)).catch((err) => { throw alarmHttpError(err) })
})
