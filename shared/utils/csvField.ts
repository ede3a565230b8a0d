// One CSV field as RFC 4180 writes it: quoted when it holds a comma, a quote or a line break, with
// quotes doubled. Text that a spreadsheet would run as a formula (starting with = + - @, a tab or
// CR) is written with a leading apostrophe, as the OWASP CSV-injection guidance advises
// [common practice]. Numbers are written as they are, so negative values stay numbers.
export function csvField(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return ''
  if (typeof value === 'number') return String(value)
  const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe
}

/** One CSV record (no line end). */
export const csvRecord = (fields: readonly (string | number | null | undefined)[]) => fields.map(csvField).join(',')
