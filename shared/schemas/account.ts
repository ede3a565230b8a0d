import { z } from 'zod'
import { displayNameField, textField } from './fields'
import { ROLES } from '../utils/roles'

/**
 * Password length after NIST SP 800-63B-4 §3.1.1.2 [from memory]: a password that is the only
 * factor SHALL be at least 15 characters, verifiers SHOULD accept at least 64, and SHALL NOT
 * impose composition rules. Brinkline has no second factor, so 15; 128 leaves room for
 * pass-phrases and password managers. Length counts Unicode code points after NFKC (§3.1.1.2:
 * normalise before hashing), the same way the server counts.
 */
export const PASSWORD_MIN = 15
export const PASSWORD_MAX = 128

export const normalisePassword = (p: string) => p.normalize('NFKC')
const codePoints = (p: string) => [...normalisePassword(p)].length

export const newPasswordField = textField()
  .refine(p => codePoints(p) >= PASSWORD_MIN, `must have at least ${PASSWORD_MIN} characters (a few words make a good one)`)
  .refine(p => codePoints(p) <= PASSWORD_MAX, `must have at most ${PASSWORD_MAX} characters`)

const roleField = z.enum(ROLES, { errorMap: () => ({ message: `must be one of ${ROLES.join(', ')}` }) })

const nameField = displayNameField()

export const userCreateSchema = z.object({
  email: textField().trim().toLowerCase().email('must be an e-mail address').max(254, 'is too long'),
  name: nameField,
  role: roleField,
})
export type UserCreate = z.infer<typeof userCreateSchema>

export const userUpdateSchema = z.object({
  name: nameField.optional(),
  role: roleField.optional(),
  active: z.boolean({ invalid_type_error: 'must be true or false' }).optional(),
}).strict().refine(v => Object.keys(v).length > 0, 'give at least one of name, role, active')
export type UserUpdate = z.infer<typeof userUpdateSchema>

export const setPasswordSchema = z.object({
  token: textField().regex(/^[A-Za-z0-9_-]{43}$/, 'is not a valid link token'),
  password: newPasswordField,
})

export const changePasswordSchema = z.object({
  currentPassword: textField().min(1, 'is required').max(200, 'is too long'),
  newPassword: newPasswordField,
})
