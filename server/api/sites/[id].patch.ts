import { idParamsSchema } from '#shared/schemas/fields'
import { sitePatchSchema } from '#shared/schemas/plant'
import { plantHttpError } from '../../services/plantModel/errors'
import { updateSite } from '../../services/plantModel/sites'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const patch = await validBody(event, sitePatchSchema)
  return useDb().transaction(async (tx) => {
    const result = await updateSite(tx, id, patch).catch((err) => { throw plantHttpError(err) })
    if (!result) throw createError({ statusCode: 404, message: `Site ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'site.update', target: result.site.code, detail: { id, changed: result.changed }, address: clientAddress(event) })
    return result.site
  })
})
