import { shiftLogQuerySchema } from '#shared/schemas/shiftLog'

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const query = await validQuery(event, shiftLogQuerySchema)
  return listShiftLogNotes(useDb(), query)
})
