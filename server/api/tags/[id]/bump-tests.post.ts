import { bumpTestCreateSchema } from '#shared/schemas/bumpTest'
import { idParamsSchema } from '#shared/schemas/fields'
import { BumpTestRefused, createBumpTest } from '../../../services/bumpTests/bumpTests'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const input = await validBody(event, bumpTestCreateSchema)
  const created = await useDb().transaction(async (tx) => {
    const test = await createBumpTest(tx, id, input, user.id).catch((err) => {
      if (err instanceof BumpTestRefused) throw createError({ statusCode: 400, message: err.message })
      throw err
    })
    if (!test) throw createError({ statusCode: 404, message: `Tag ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'bump_test.create', target: `tag ${id}`, detail: { id: test.id, after: test }, address: clientAddress(event) })
    return test
  })
  setResponseStatus(event, 201)
  return created
})
