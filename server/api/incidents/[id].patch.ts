import { idParamsSchema } from '#shared/schemas/fields'
import { incidentFindingsSchema } from '#shared/schemas/incident'

// Findings (what happened, cause, actions, lessons) and the title: supervisors only, audited.
export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'review')
  const { id } = await validParams(event, idParamsSchema)
  const input = await validBody(event, incidentFindingsSchema)
  return saveFindings(useDb(), { userId: user.id, address: clientAddress(event) }, id, input).catch((err) => { throw reviewHttpError(err) })
})
