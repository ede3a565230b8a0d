import { idParamsSchema } from '#shared/schemas/fields'
import { unitPatchSchema } from '#shared/schemas/plant'
import { plantHttpError } from '../../services/plantModel/errors'
import { updateUnit } from '../../services/plantModel/units'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const { id } = await validParams(event, idParamsSchema)
  const patch = await validBody(event, unitPatchSchema)
  return useDb().transaction(async (tx) => {
    const result = await updateUnit(tx, id, patch).catch((err) => { throw plantHttpError(err) })
    if (!result) throw createError({ statusCode: 404, message: `Unit ${id} not found` })
    await writeAudit(tx, { userId: user.id, action: 'unit.update', target: result.unit.code, detail: { id, changed: result.changed }, address: clientAddress(event) })
    return result.unit
  })
})
