import { idParamsSchema } from '#shared/schemas/fields'
import { incidentStateSchema } from '#shared/schemas/incident'

// open → under review → closed; closing signs off with the supervisor's name and the time.
export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'review')
  const { id } = await validParams(event, idParamsSchema)
  const { state } = await validBody(event, incidentStateSchema)
  return moveIncident(useDb(), { userId: user.id, address: clientAddress(event) }, id, state).catch((err) => { throw reviewHttpError(err) })
})
