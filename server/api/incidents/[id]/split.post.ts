import { idParamsSchema } from '#shared/schemas/fields'
import { incidentSplitSchema } from '#shared/schemas/incident'

// Moves the named alarms into a new incident of the same unit.
export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'review')
  const { id } = await validParams(event, idParamsSchema)
  const input = await validBody(event, incidentSplitSchema)
  const split = await splitIncident(useDb(), { userId: user.id, address: clientAddress(event) }, id, input)
    .catch((err) => { throw reviewHttpError(err) })
  setResponseStatus(event, 201)
  return split
})
