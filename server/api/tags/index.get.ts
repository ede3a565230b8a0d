export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const rows = await listTagsWithLatest(useDb())
  // Raw sql columns come back as strings from postgres.js: convert once, at the edge.
  return rows.map(r => ({ ...r, latestValue: r.latestValue === null ? null : Number(r.latestValue),
    latestTime: r.latestTime === null ? null : new Date(r.latestTime).toISOString() }))
})
