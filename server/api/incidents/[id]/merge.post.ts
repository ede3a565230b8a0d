import { idParamsSchema } from '#shared/schemas/fields'
import { incidentMergeSchema } from '#shared/schemas/incident'

// Takes every alarm of another incident of the same unit into this one; the other goes.
export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'review')
  const { id } = await validParams(event, idParamsSchema)
  const { incidentId } = await validBody(event, incidentMergeSchema)
  return mergeIncidents(useDb(), { userId: user.id, address: clientAddress(event) }, id, incidentId)
    .catch((err) => { throw reviewHttpError(err) })
})
