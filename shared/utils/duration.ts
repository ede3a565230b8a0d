// The one duration formatter: screens, alarm mail, tag status reasons and shift texts all read
// spans the same way. Imports nothing, so every part of shared/ may use it.

/**
 * A span of seconds the way a shift reads it: "2 h 05 min", "12 min", "40 s", "3 d 4 h".
 * The span is rounded to the smallest unit shown before it is split, so 7,170 s (119.5 min) reads
 * "2 h 00 min", never "1 h 60 min". An infinite span is "unbounded" (a fold band with no end).
 */
export function formatDuration(seconds: number): string {
  if (Number.isNaN(seconds)) return '—'
  if (!Number.isFinite(seconds)) return 'unbounded'
  const sign = seconds < 0 ? '−' : ''
  const s = Math.round(Math.abs(seconds))
  if (s < 60) return `${sign}${s} s`
  const minutes = Math.round(s / 60)
  if (minutes < 60) return `${sign}${minutes} min`
  if (minutes < 24 * 60) return `${sign}${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, '0')} min`
  const hours = Math.round(s / 3_600)
  return `${sign}${Math.floor(hours / 24)} d ${hours % 24} h`
}
