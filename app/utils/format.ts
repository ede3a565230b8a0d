/** Engineering display: enough significant digits to read a trend, never a wall of decimals. */
export function formatValue(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  const abs = Math.abs(value)
  if (abs !== 0 && (abs >= 1e6 || abs < 1e-3)) return value.toExponential(2)
  return Number(value.toPrecision(digits)).toString()
}

/** Plant-local time, explicit about the zone (times are stored in UTC). */
export function formatTime(iso: string | null | undefined, timeZone = 'UTC'): string {
  if (!iso) return '—'
  return new Intl.DateTimeFormat('en-GB', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit',
  }).format(new Date(iso))
}
