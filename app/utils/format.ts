/** Engineering display: enough significant digits to read a trend, never scientific notation (shared/utils/numberText.ts). */
export function formatValue(value: number | null | undefined, digits = 4): string {
  return plainNumber(value, digits)
}

/** Wall-clock time in `timeZone`, year-month-day (the one format of every screen; shared/utils/timeText.ts). */
export function formatTime(iso: string | null | undefined, timeZone = 'UTC'): string {
  if (!iso) return '—'
  return wallClockText(iso, timeZone)
}
