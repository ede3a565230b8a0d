import { passwordProblem } from '../services/accounts/passwordPolicy'

/** 400 naming the field when a new password is on the common list or built from context words. */
export function requireAcceptablePassword(password: string, email: string, field: string): void {
  const problem = passwordProblem(password, email)
  if (problem) throw createError({ statusCode: 400, message: `Invalid input — ${field}: ${problem}`, data: { issues: [{ field, reason: problem }] } })
}
