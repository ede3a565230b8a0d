import { changePasswordSchema } from '#shared/schemas/account'

// A signed-in user changes their own password (the current one is required). Other sessions end;
// this one is renewed so the user stays signed in here.
export default defineEventHandler(async (event) => {
  const { user } = await requireLiveSession(event)
  const { currentPassword, newPassword } = await validBody(event, changePasswordSchema)
  const outcome = await changeOwnPassword(useDb(), { user, currentPassword, newPassword, address: clientAddress(event) },
    { hashPassword, verifyPassword })
  if (!outcome.changed) throw createError({ statusCode: outcome.statusCode, message: outcome.message })
  // A fresh sign-in time after the cut-off keeps this browser signed in.
  const now = outcome.at.getTime() + 1
  await setUserSession(event, { user, loggedInAt: now, lastSeenAt: now })
  return { passwordChanged: true }
})
