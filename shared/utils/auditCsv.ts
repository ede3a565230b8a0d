// The audit log as CSV: RFC 4180 records with CRLF line ends; each field written by csvField
// (quoting, and the leading apostrophe against spreadsheet formulas).
import { csvRecord } from './csvField'

export interface AuditCsvRow {
  id: number, at: string, userEmail: string | null, action: string, target: string, address: string, detail: unknown
}

export function auditCsv(rows: readonly AuditCsvRow[]): string {
  const lines = [['id', 'time_utc', 'user', 'action', 'target', 'address', 'detail'].join(',')]
  for (const r of rows)
    lines.push(csvRecord([String(r.id), r.at, r.userEmail ?? '', r.action, r.target, r.address, JSON.stringify(r.detail ?? {})]))
  return `${lines.join('\r\n')}\r\n`
}
