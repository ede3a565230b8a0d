/** A span of seconds the way a shift reads it: "2 h 05 min", "12 min", "40 s", "3 d 4 h". */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return '—'
  const s = Math.round(Math.abs(seconds))
  const sign = seconds < 0 ? '−' : ''
  if (s < 60) return `${sign}${s} s`
  if (s < 3_600) return `${sign}${Math.round(s / 60)} min`
  if (s < 86_400) return `${sign}${Math.floor(s / 3_600)} h ${String(Math.round((s % 3_600) / 60)).padStart(2, '0')} min`
  return `${sign}${Math.floor(s / 86_400)} d ${Math.round((s % 86_400) / 3_600)} h`
}
