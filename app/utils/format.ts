/** Engineering display: enough significant digits to read a trend, never scientific notation (shared/utils/numberText.ts). */
export function formatValue(value: number | null | undefined, digits = 4): string {
  return plainNumber(value, digits)
}

/** Wall-clock time in `timeZone`, year-month-day (the one format of every screen; shared/utils/timeText.ts). */
export function formatTime(iso: string | null | undefined, timeZone = 'UTC'): string {
  if (!iso) return '—'
  return wallClockText(iso, timeZone)
}

/** Bytes in binary units (KiB = 1,024 bytes, IEC 80000-13), three significant digits. */
export function formatBytes(bytes: number | null | undefined): string {
  if (bytes === null || bytes === undefined || !Number.isFinite(bytes)) return '—'
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB']
  let value = Math.abs(bytes)
  let unit = 0
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024
    unit++
  }
  const text = unit === 0 ? String(Math.round(value)) : plainNumber(value, 3)
  return `${bytes < 0 ? '−' : ''}${text} ${units[unit]}`
}
