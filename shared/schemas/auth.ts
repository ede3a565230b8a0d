import { z } from 'zod'
import { textField } from './fields'

export const signInSchema = z.object({
  email: textField().trim().toLowerCase().email('must be an e-mail address').max(254),
  password: textField().min(1, 'is required').max(200, 'is too long'),
})
export type SignIn = z.infer<typeof signInSchema>
