import { z } from 'zod'
import { passwordLinkOwner } from '../../services/accounts/passwordLinks'

const querySchema = z.object({ token: z.string({ required_error: 'is required' }).regex(/^[A-Za-z0-9_-]{43}$/, 'is not a valid link token') })

// Lets the set-password page say at once whether its link still works, and greet its owner.
export default defineEventHandler(async (event) => {
  const { token } = await validQuery(event, querySchema)
  const owner = await passwordLinkOwner(useDb(), token)
  if (!owner) throw createError({ statusCode: 410, message: 'token: this link has been used or has expired; ask an administrator for a new one' })
  return owner
})
