export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  return listSites(useDb())
})
