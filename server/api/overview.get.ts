export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  return readOverview(useDb())
})
