import { z } from 'zod'

export const signInSchema = z.object({
  email: z.string({ required_error: 'is required' }).trim().toLowerCase().email('must be an e-mail address').max(254),
  password: z.string({ required_error: 'is required' }).min(1, 'is required').max(200, 'is too long'),
})
export type SignIn = z.infer<typeof signInSchema>
