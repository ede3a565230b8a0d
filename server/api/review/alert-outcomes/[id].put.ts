import { idParamsSchema } from '#shared/schemas/fields'
import { alertOutcomeSchema } from '#shared/schemas/incident'

// The supervisor's verdict on an early-warning alert (id: the alarm occurrence): false or averted; null clears it.
export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'review')
  const { id } = await validParams(event, idParamsSchema)
  const input = await validBody(event, alertOutcomeSchema)
  return markAlertOutcome(useDb(), { userId: user.id, address: clientAddress(event) }, id, input)
    .catch((err) => { throw reviewHttpError(err) })
})
