import { idParamsSchema } from '#shared/schemas/fields'
import { fitStoredBumpTest } from '../../../services/bumpTests/bumpTests'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  return useDb().transaction(async (tx) => {
    const fitted = await fitStoredBumpTest(tx, id)
    if (!fitted) throw createError({ statusCode: 404, message: `Bump test ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'bump_test.fit', target: `tag ${fitted.tagId}`, detail: { id, after: fitted }, address: clientAddress(event) })
    return fitted
  })
})
