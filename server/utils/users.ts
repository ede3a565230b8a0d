import { asc, desc } from 'drizzle-orm'
import { auditLog, users } from '../db/schema'

export function listUsers(db: Db) {
  return db.select({ id: users.id, email: users.email, name: users.name, role: users.role, active: users.active,
    createdAt: users.createdAt, lastSignInAt: users.lastSignInAt }).from(users).orderBy(asc(users.email))
}

export function listAudit(db: Db, limit: number) {
  return db.select().from(auditLog).orderBy(desc(auditLog.id)).limit(limit)
}
