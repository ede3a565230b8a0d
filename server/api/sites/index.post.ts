import { siteCreateSchema } from '#shared/schemas/plant'
import { plantHttpError } from '../../services/plantModel/errors'
import { createSite } from '../../services/plantModel/sites'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const input = await validBody(event, siteCreateSchema)
  const created = await useDb().transaction(async (tx) => {
    const row = await createSite(tx, input).catch((err) => { throw plantHttpError(err) })
    await writeAudit(tx, { userId: user.id, action: 'site.create', target: row.code, detail: { id: row.id, after: row }, address: clientAddress(event) })
    return row
  })
  setResponseStatus(event, 201)
  return created
})
