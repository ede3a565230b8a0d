export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  return listUnits(useDb())
})
