import { alarmRuleCreateSchema } from '#shared/schemas/alarmRule'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const input = await validBody(event, alarmRuleCreateSchema)
  const rule = await useDb().transaction(async (tx) => {
    const created = await createRule(tx, input, user.id).catch((err) => {
      if (err instanceof RuleTargetMissing) throw createError({ statusCode: 400, message: err.message })
      throw constraintHttpError(err, { duplicate: `name: a rule called "${input.name}" already exists on this site` })
    })
    await writeAudit(tx, { userId: user.id, action: 'alarm_rule.create', target: created.name, detail: { id: created.id, ...input }, address: clientAddress(event) })
    return created
  })
  setResponseStatus(event, 201)
  return rule
})
