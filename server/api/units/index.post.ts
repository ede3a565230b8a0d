import { unitCreateSchema } from '#shared/schemas/plant'
import { plantHttpError } from '../../services/plantModel/errors'
import { createUnit } from '../../services/plantModel/units'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const input = await validBody(event, unitCreateSchema)
  const created = await useDb().transaction(async (tx) => {
    const row = await createUnit(tx, input).catch((err) => { throw plantHttpError(err) })
    await writeAudit(tx, { userId: user.id, action: 'unit.create', target: row.code, detail: { id: row.id, after: row }, address: clientAddress(event) })
    return row
  })
  setResponseStatus(event, 201)
  return created
})
