import { incidentCreateSchema } from '#shared/schemas/incident'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'review')
  const input = await validBody(event, incidentCreateSchema)
  const created = await openIncident(useDb(), { userId: user.id, address: clientAddress(event) }, input)
    .catch((err) => { throw reviewHttpError(err) })
  setResponseStatus(event, 201)
  return created
})
