import { unshelveSchema } from '#shared/schemas/alarm'
import { idParamsSchema } from '#shared/schemas/fields'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'respond')
  const { id } = await validParams(event, idParamsSchema)
  const { comment } = await validBody(event, unshelveSchema)
  return unshelveAlarm(useDb(), id, comment, changeContext(user.id)).catch((err) => { throw alarmHttpError(err) })
})
