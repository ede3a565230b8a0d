export default defineEventHandler(async (event) => {
  const { user, id } = await requireLiveSession(event)
  const db = useDb()
  if (id) await revokeSession(db, id, useRuntimeConfig(event).session.maxAge ?? 43_200)
  await writeAudit(db, { userId: user.id, action: 'sign-out', target: user.email, address: clientAddress(event) })
  await clearUserSession(event)
  return { signedOut: true }
})
