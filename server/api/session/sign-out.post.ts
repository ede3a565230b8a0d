export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  await writeAudit(useDb(), { userId: user.id, action: 'sign-out', target: user.email, address: clientAddress(event) })
  await clearUserSession(event)
  return { signedOut: true }
})
