/** The fields an audit record's before/after changed, for one readable line per change. */
export interface AuditChange { field: string, before: unknown, after: unknown }

export function auditChanges(detail: unknown): AuditChange[] {
  const d = (detail ?? {}) as { before?: Record<string, unknown> | null, after?: Record<string, unknown> | null }
  if (d.before === undefined && d.after === undefined) return []
  const before = d.before ?? {}
  const after = d.after ?? {}
  const fields = [...new Set([...Object.keys(before), ...Object.keys(after)])]
  return fields
    .filter(f => JSON.stringify(before[f]) !== JSON.stringify(after[f]))
    .map(f => ({ field: f, before: d.before === null ? undefined : before[f], after: d.after === null ? undefined : after[f] }))
}
