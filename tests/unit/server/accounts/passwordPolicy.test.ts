import { describe, expect, it } from 'vitest'
import { newPasswordField, PASSWORD_MAX, PASSWORD_MIN } from '../../../../shared/schemas/account'
import { passwordProblem } from '../../../../server/services/accounts/passwordPolicy'

// NIST SP 800-63B-4 §3.1.1.2 [from memory]: length is what counts — at least 15 characters for a
// single-factor password, at least 64 accepted, no composition rules, a blocklist of common or
// compromised values and of context words, Unicode normalised before counting and hashing.
describe('password rules (NIST SP 800-63B)', () => {
  it('counts characters, not bytes, after NFKC normalisation', () => {
    expect(PASSWORD_MIN).toBe(15)
    expect(PASSWORD_MAX).toBeGreaterThanOrEqual(64)
    expect(newPasswordField.safeParse('a'.repeat(14)).success).toBe(false)
    // 15 code points of Greek letters are 30 UTF-8 bytes; still 15 characters.
    expect(newPasswordField.safeParse('αβγδεζηθικλμνξο').success).toBe(true)
    // U+FB01 (ﬁ ligature) normalises under NFKC to "fi", two characters.
    expect(newPasswordField.safeParse('\uFB01'.repeat(7) + 'x').success).toBe(true)
    expect(newPasswordField.safeParse('x'.repeat(PASSWORD_MAX + 1)).success).toBe(false)
  })

  it('has no composition rules: lower-case words only are fine', () => {
    expect(newPasswordField.safeParse('copper kettle under amber sky').success).toBe(true)
    expect(passwordProblem('copper kettle under amber sky')).toBeNull()
  })

  it('refuses entries of the common-password list, in any letter case', () => {
    // Both are in the zxcvbn-ts `passwords-common` dictionary (@zxcvbn-ts/language-common 4.1.3).
    expect(passwordProblem('passwordpassword')).toMatch(/commonly used/)
    expect(passwordProblem('1QAZ2wsx3EDC4rfv')).toMatch(/commonly used/)
  })

  it('refuses repetition and context words (service name, own address)', () => {
    expect(passwordProblem('aaaaaaaaaaaaaaaa')).toMatch(/repeats/)
    expect(passwordProblem('abababababababab')).toMatch(/repeats/)
    expect(passwordProblem('Brinkline2026!!!')).toMatch(/service name/)
    expect(passwordProblem('nia.brook#123456', 'nia.brook@harrowgate.example')).toBeNull()
    expect(passwordProblem('niabrook-2026-05', 'niabrook@harrowgate.example')).toMatch(/own address/)
  })
})
