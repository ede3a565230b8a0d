import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'

// The shift handover: any signed-in role reads it.
export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  return { advisory: ADVISORY_CAUTION, ...await shiftHandover(useDb()) }
})
