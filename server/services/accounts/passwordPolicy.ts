import { dictionary } from '@zxcvbn-ts/language-common'
import { normalisePassword } from '../../../shared/schemas/account'

// NIST SP 800-63B-4 §3.1.1.2 [from memory]: compare new passwords against a blocklist of values
// known to be commonly used or compromised, and against context-specific words (the service name,
// the user's own address). The list is the ranked `passwords-common` dictionary of
// @zxcvbn-ts/language-common 4.1.3 (49,233 entries from public password corpora, pinned exactly).
// Loaded once, on first use, into a Set of lower-case entries.
let common: Set<string> | undefined
const commonPasswords = () => (common ??= new Set(dictionary['passwords-common'].map(p => p.toLowerCase())))

const CONTEXT_WORDS = ['brinkline', 'harrowgate', 'password']

/** Why this password may not be used, or null. Length is checked by the zod contract. */
export function passwordProblem(password: string, email?: string): string | null {
  const p = normalisePassword(password).toLowerCase()
  if (commonPasswords().has(p)) return 'is on the list of commonly used passwords; choose another'
  if (new Set(p).size <= 2) return 'repeats one or two characters; choose something less predictable'
  const local = email?.split('@')[0]?.toLowerCase()
  const words = [...CONTEXT_WORDS, ...(local && local.length >= 4 ? [local] : [])]
  // A password that is only a context word plus a few digits or symbols is as weak as the word.
  const stripped = p.replace(/[^a-z]/g, '')
  if (words.some(w => stripped === w || stripped === w + w)) return 'is built from the service name or your own address; choose another'
  return null
}
