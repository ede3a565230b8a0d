import { incidentListQuerySchema } from '#shared/schemas/incident'

// Every signed-in role may read incidents; only supervisors change them.
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const query = await validQuery(event, incidentListQuerySchema)
  return listIncidents(useDb(), query)
})
