// The audit log as CSV (RFC 4180: comma-separated, CRLF line ends, fields with a comma, quote or
// line break quoted, quotes doubled). A field that would start a spreadsheet formula (= + - @,
// tab, CR) gets a leading apostrophe, as the OWASP CSV-injection guidance advises [common practice].
export interface AuditCsvRow { id: number, at: string, userEmail: string | null, action: string, target: string, address: string, detail: unknown }

export function csvField(value: string): string {
  const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe
}

export function auditCsv(rows: readonly AuditCsvRow[]): string {
  const lines = [['id', 'time_utc', 'user', 'action', 'target', 'address', 'detail'].join(',')]
  for (const r of rows)
    lines.push([String(r.id), r.at, r.userEmail ?? '', r.action, r.target, r.address, JSON.stringify(r.detail ?? {})].map(csvField).join(','))
  return `${lines.join('\r\n')}\r\n`
}
