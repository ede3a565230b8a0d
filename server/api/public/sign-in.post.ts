import { signInSchema } from '#shared/schemas/auth'
import { normalisePassword } from '#shared/schemas/account'

export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, signInSchema)
  const db = useDb()
  const address = clientAddress(event)
  if (await signInBlocked(db, email, address)) {
    setResponseHeader(event, 'Retry-After', SIGN_IN_LIMITS.windowMinutes * 60)
    throw createError({ statusCode: 429, message: `Too many failed sign-ins; try again in ${SIGN_IN_LIMITS.windowMinutes} minutes` })
  }
  const user = await findActiveUserByEmail(db, email)
  if (!user?.passwordHash || !(await verifyPassword(user.passwordHash, normalisePassword(password)))) {
    await recordSignInFailure(db, email, address)
    await writeAudit(db, { userId: user?.id ?? null, action: 'sign-in.failed', target: email, address })
    // Same answer for unknown account and wrong password: don't reveal which accounts exist.
    throw createError({ statusCode: 401, message: 'E-mail or password is wrong' })
  }
  await markSignedIn(db, user.id, email)
  await writeAudit(db, { userId: user.id, action: 'sign-in', target: email, address })
  const sessionUser = { id: user.id, email: user.email, name: user.name, role: user.role }
  const now = Date.now()
  await startFreshSession(event, { user: sessionUser, loggedInAt: now, lastSeenAt: now })
  return { user: sessionUser }
})
