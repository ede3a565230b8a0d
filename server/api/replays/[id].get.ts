import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { idParamsSchema } from '#shared/schemas/fields'
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const replay = await getReplay(useDb(), id)
  if (!replay) throw createError({ statusCode: 404, message: `Replay ${id} not found` })
  return { ...replay, advisory: ADVISORY_CAUTION }
})
