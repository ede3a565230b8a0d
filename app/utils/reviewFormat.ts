import type { FigureFormat, Assessment } from '#shared/alarms/healthFigures'

/** A health figure as the review pages print it. */
export function figureText(value: number, format: FigureFormat): string {
  if (format === 'share') return `${(value * 100).toFixed(1)} %`
  if (format === 'duration') return value > 0 ? formatDuration(value) : '—'
  if (format === 'rate') return formatValue(value, 3)
  return String(value)
}

export const ASSESSMENT_TEXT: Record<Assessment, string> = { meets: 'meets target', near: 'manageable', misses: 'beyond target' }

/** Lead time in words: "18 min before", "2 min after" (negative: the alert came later). */
export function leadText(leadTimeS: number | null | undefined): string {
  if (leadTimeS === null || leadTimeS === undefined) return '—'
  return `${formatDuration(Math.abs(leadTimeS))} ${leadTimeS >= 0 ? 'before' : 'after'}`
}
