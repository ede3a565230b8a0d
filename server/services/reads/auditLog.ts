import { desc } from 'drizzle-orm'
import { auditLog } from '../../db/schema'
import type { Db } from '../../utils/db'

export function listAudit(db: Db, limit: number) {
  return db.select().from(auditLog).orderBy(desc(auditLog.id)).limit(limit)
}
