// Human-readable times and numbers for messages: UTC is stored, plant-local time is shown
// beside it (docs/design.md §D9).

/** "2026-01-05 09:00:00 Europe/London (08:00:00 UTC)". */
export function plantTime(iso: string | Date, timeZone: string): string {
  const date = new Date(iso)
  const local = new Intl.DateTimeFormat('en-CA', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23',
  }).format(date).replace(',', '')
  return `${local} ${timeZone} (${date.toISOString().slice(11, 19)} UTC)`
}

/** Four significant figures, no exponent for everyday magnitudes. */
export function number(value: number | null | undefined): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—'
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞'
  const abs = Math.abs(value)
  if (abs !== 0 && (abs < 1e-3 || abs >= 1e6)) return value.toExponential(3)
  return String(Number(value.toPrecision(4)))
}
