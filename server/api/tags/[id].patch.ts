import { idParamsSchema } from '#shared/schemas/fields'
import { tagPatchSchema } from '#shared/schemas/plant'
import { plantHttpError } from '../../services/plantModel/errors'
import { updateTag } from '../../services/plantModel/tags'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const patch = await validBody(event, tagPatchSchema)
  return useDb().transaction(async (tx) => {
    const result = await updateTag(tx, id, patch).catch((err) => { throw plantHttpError(err) })
    if (!result) throw createError({ statusCode: 404, message: `Tag ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'tag.update', target: result.tag.code, detail: { id, changed: result.changed }, address: clientAddress(event) })
    return result.tag
  })
})
