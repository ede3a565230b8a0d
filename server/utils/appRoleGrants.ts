import type { Db } from './db'

/**
 * What the app role may do (issue 13 item 8), granted by the schema owner after every migration
 * run, so a table a migration adds is covered at once: rows of every table, except that the audit
 * log and the alarm events can only be read and appended to. Owning nothing, the app role cannot
 * drop, alter or truncate a table, nor switch off the append-only triggers. Partitions it needs
 * are made by brinkline_ensure_partition, a security-definer function.
 */
export async function grantAppRole(owner: Db, appRole: string): Promise<void> {
  const sql = owner.$sql
  const role = sql(appRole)
  await sql.begin(async (tx) => {
    await tx`grant usage on schema public to ${role}`
    await tx`grant select, insert, update, delete on all tables in schema public to ${role}`
    await tx`revoke update, delete, truncate on audit_log, alarm_events from ${role}`
    await tx`grant usage, select on all sequences in schema public to ${role}`
    await tx`grant execute on all functions in schema public to ${role}`
  })
}
