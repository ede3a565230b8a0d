import { createCipheriv, createDecipheriv, randomBytes } from 'node:crypto'

// OPC UA passwords must be sent to the plant server, so they are stored reversibly: AES-256-GCM
// under a key that lives only in the environment (BRINKLINE_OPCUA_SECRET_KEY, 32 bytes as 64 hex
// characters or base64), never in the database. Stored form: v1.<iv>.<tag>.<ciphertext>, base64url.
const ENV = 'BRINKLINE_OPCUA_SECRET_KEY'

function secretKey(): Buffer {
  const raw = process.env[ENV]?.trim()
  if (!raw) throw new Error(`${ENV} is not set: it is needed to store or use an OPC UA password`)
  const key = /^[0-9a-f]{64}$/i.test(raw) ? Buffer.from(raw, 'hex') : Buffer.from(raw, 'base64')
  if (key.length !== 32) throw new Error(`${ENV} must hold 32 bytes (64 hex characters or base64)`)
  return key
}

/** Whether passwords can be stored on this server (the admin screen says so when not). */
export const secretKeyConfigured = () => {
  try {
    secretKey()
    return true
  }
  catch {
    return false
  }
}

export function encryptSecret(plain: string): string {
  const iv = randomBytes(12)
  const cipher = createCipheriv('aes-256-gcm', secretKey(), iv)
  const body = Buffer.concat([cipher.update(plain, 'utf8'), cipher.final()])
  return ['v1', iv, cipher.getAuthTag(), body].map(p => (typeof p === 'string' ? p : p.toString('base64url'))).join('.')
}

export function decryptSecret(stored: string): string {
  const [version, iv, tag, body] = stored.split('.')
  if (version !== 'v1' || !iv || !tag || body === undefined) throw new Error('stored OPC UA password has an unknown format')
  const decipher = createDecipheriv('aes-256-gcm', secretKey(), Buffer.from(iv, 'base64url'))
  decipher.setAuthTag(Buffer.from(tag, 'base64url'))
  return Buffer.concat([decipher.update(Buffer.from(body, 'base64url')), decipher.final()]).toString('utf8')
}
