import { shiftLogCreateSchema } from '#shared/schemas/shiftLog'

export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'respond')
  const input = await validBody(event, shiftLogCreateSchema)
  try {
    const note = await addShiftLogNote(useDb(), user.id, input)
    setResponseStatus(event, 201)
    return note
  }
  catch (err) {
    if (err instanceof ShiftLogLinkError) {
      throw createError({ statusCode: 400, message: err.message, data: { issues: [{ field: err.field, reason: err.message }] } })
    }
    throw err
  }
})
