import { idParamsSchema } from '#shared/schemas/fields'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { id } = await validParams(event, idParamsSchema)
  const rule = await getRule(useDb(), id)
  if (!rule) throw createError({ statusCode: 404, message: `Rule ${id} not found` })
  return rule
})
