import { and, desc, eq, gte, like, lt } from 'drizzle-orm'
import type { AuditQuery } from '../../../shared/schemas/audit'
import { auditLog, users } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'

/** Audit records matching the filters, newest first, with the acting user's address. */
export function listAudit(db: DbExecutor, q: AuditQuery) {
  // An action ending in "." is a family (user., gateway.); LIKE wildcards in it are taken literally.
  const action = q.action
    ? (q.action.endsWith('.') ? like(auditLog.action, `${q.action.replace(/[\\%_]/g, '\\$&')}%`) : eq(auditLog.action, q.action))
    : undefined
  return db.select({
    id: auditLog.id, at: auditLog.at, userId: auditLog.userId, userEmail: users.email,
    action: auditLog.action, target: auditLog.target, detail: auditLog.detail, address: auditLog.address,
  }).from(auditLog).leftJoin(users, eq(users.id, auditLog.userId))
    .where(and(
      q.userId !== undefined ? eq(auditLog.userId, q.userId) : undefined,
      action,
      q.from ? gte(auditLog.at, q.from) : undefined,
      q.to ? lt(auditLog.at, q.to) : undefined,
    ))
    .orderBy(desc(auditLog.id)).limit(q.limit)
}
