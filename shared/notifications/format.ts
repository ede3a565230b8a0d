// Human-readable times and durations for messages: UTC is stored, plant-local time is shown
// beside it (docs/design.md §D9).

/** "2026-01-05 09:00:00 Europe/London (08:00:00 UTC)". */
export function plantTime(iso: string | Date, timeZone: string): string {
  const date = new Date(iso)
  const local = new Intl.DateTimeFormat('en-CA', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23',
  }).format(date).replace(',', '')
  return `${local} ${timeZone} (${date.toISOString().slice(11, 19)} UTC)`
}

/** "1 h 05 min", "12 min", "45 s", "3 d 4 h". */
export function duration(seconds: number): string {
  if (!Number.isFinite(seconds)) return 'unbounded'
  const sign = seconds < 0 ? '−' : ''
  let s = Math.round(Math.abs(seconds))
  if (s < 60) return `${sign}${s} s`
  const d = Math.floor(s / 86_400)
  s -= d * 86_400
  const h = Math.floor(s / 3600)
  const m = Math.floor((s - h * 3600) / 60)
  if (d > 0) return `${sign}${d} d ${h} h`
  if (h > 0) return `${sign}${h} h ${String(m).padStart(2, '0')} min`
  return `${sign}${m} min`
}

/** Four significant figures, no exponent for everyday magnitudes. */
export function number(value: number | null | undefined): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—'
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞'
  const abs = Math.abs(value)
  if (abs !== 0 && (abs < 1e-3 || abs >= 1e6)) return value.toExponential(3)
  return String(Number(value.toPrecision(4)))
}
