export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return listGateways(useDb())
})
