import { idParamsSchema } from '#shared/schemas/fields'
import { alarmRulePatchSchema } from '#shared/schemas/alarmRule'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const patch = await validBody(event, alarmRulePatchSchema)
  return useDb().transaction(async (tx) => {
    const result = await updateRule(tx, id, patch, changeContext(user.id)).catch((err) => {
      throw alarmHttpError(constraintHttpError(err, { duplicate: `name: a rule called "${patch.name}" already exists on this site` }))
    })
    if (!result) throw createError({ statusCode: 404, message: `Rule ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'alarm_rule.update', target: result.rule.name, detail: { id, changed: result.changed }, address: clientAddress(event) })
    return result.rule
  })
})
