import { idParamsSchema } from '#shared/schemas/fields'
import { listBumpTests } from '../../../services/bumpTests/bumpTests'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const list = await listBumpTests(useDb(), id)
  if (!list) throw createError({ statusCode: 404, message: `Tag ${id} not found` })
  return list
})
