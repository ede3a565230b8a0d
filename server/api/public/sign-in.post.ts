import { signInSchema } from '#shared/schemas/auth'
import { normalisePassword } from '#shared/schemas/account'

export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, signInSchema)
  const db = useDb()
  const address = clientAddress(event)
  const reservation = await useSignInLimiter().reserve(email, address)
  if (!reservation.allowed) {
    setResponseHeader(event, 'Retry-After', reservation.retryAfterS)
    await writeAudit(db, { userId: null, action: 'sign-in.limited', target: email, address, detail: { limit: reservation.limit } })
    throw createError({ statusCode: 429, message: `Too many ${reservation.limit}; try again in ${reservation.retryAfterS} s` })
  }
  const user = await findActiveUserByEmail(db, email)
  // Always one scrypt check, against a dummy hash for an unknown account: equal work, equal time.
  const passwordOk = await verifyPassword(user?.passwordHash ?? await hashForUnknownAccount(), normalisePassword(password))
  if (!user?.passwordHash || !passwordOk) {
    await reservation.settle(false)
    await writeAudit(db, { userId: user?.id ?? null, action: 'sign-in.failed', target: email, address })
    // Same answer for unknown account and wrong password: don't reveal which accounts exist.
    throw createError({ statusCode: 401, message: 'E-mail or password is wrong' })
  }
  await reservation.settle(true)
  await markSignedIn(db, user.id)
  await writeAudit(db, { userId: user.id, action: 'sign-in', target: email, address })
  const sessionUser = { id: user.id, email: user.email, name: user.name, role: user.role }
  const now = Date.now()
  await startFreshSession(event, { user: sessionUser, loggedInAt: now, lastSeenAt: now })
  return { user: sessionUser }
})
