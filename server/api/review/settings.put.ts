import { reviewSettingsSchema } from '#shared/schemas/incident'

// The site's incident window: supervisors set it; the change is audited.
export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'review')
  const input = await validBody(event, reviewSettingsSchema)
  return saveReviewSettings(useDb(), { userId: user.id, address: clientAddress(event) }, input)
    .catch((err) => { throw reviewHttpError(err) })
})
