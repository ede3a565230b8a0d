import type { H3Event } from 'h3'
import { auditLog } from '../db/schema'

/** Appends one audit record; pass the transaction so the record and the change commit together. */
export async function writeAudit(db: DbExecutor, entry: {
  userId: number | null
  action: string
  target?: string
  detail?: Record<string, unknown>
  address?: string
}): Promise<void> {
  await db.insert(auditLog).values({
    userId: entry.userId,
    action: entry.action,
    target: entry.target ?? '',
    detail: entry.detail ?? {},
    address: entry.address ?? '',
  })
}

export function clientAddress(event: H3Event): string {
  return getRequestIP(event, { xForwardedFor: process.env.BRINKLINE_TRUST_PROXY === '1' }) ?? 'unknown'
}
