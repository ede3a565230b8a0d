// Rejected lines grouped by what went wrong, not by their exact words (issue 12 item 9): many
// reasons quote the line's own cell ("500 is beyond the physical bound…", "2026-03-29 01:30
// does not exist…", a conflict's two readings), so 400 lines refused for one cause would read
// as 400 causes. Both the import's counts and the page's table group with this one rule.
import type { LineRejection } from './csvSamples'

/** At most this many causes are counted apart per import; the rest are counted together. */
export const MAX_REASON_GROUPS = 50
export const OTHER_REASONS = 'other reasons (more kinds than the import counts apart)'

const ISO_INSTANT = /\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?Z/g
// A conflict names the stored and the offered reading; the examples show the line's own cell.
const CONFLICT_READINGS = /\(value [^;]*; this one [^)]*\)/

/** `text` where it stands on its own: the cell "40" is not the 40 inside "TI-401". */
const wholeToken = (text: string) => new RegExp(`(?<![\\w.])${text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}(?![\\w.])`, 'g')

/**
 * The cause of a rejection with the line's own cell (and any instant it names) left out as "…",
 * unless the reason quotes the cell as a name.
 */
export function rejectionCause(r: Pick<LineRejection, 'reason' | 'value'>): string {
  // Instants and a conflict's readings first: a short cell ("13") may sit inside them.
  let cause = r.reason.replace(ISO_INSTANT, '…').replace(CONFLICT_READINGS, '(…)')
  const cell = r.value.trim()
  // A cell the reason quotes ("unknown tag code \"XX-900\"") names what is missing: each its own cause.
  if (cell && !cause.includes(JSON.stringify(cell))) {
    // A numeric cell is quoted as the number it reads ("88.50" as 88.5).
    const asNumber = Number(cell)
    const spellings = Number.isFinite(asNumber) && String(asNumber) !== cell ? [cell, String(asNumber)] : [cell]
    for (const text of spellings) cause = cause.replace(wholeToken(text), '…')
  }
  return cause
}

/** Counts of rejections by cause, kept while an import runs; at most MAX_REASON_GROUPS causes apart. */
export function countCause(counts: Map<string, number>, r: Pick<LineRejection, 'reason' | 'value'>): void {
  let cause = rejectionCause(r)
  if (!counts.has(cause) && counts.size >= MAX_REASON_GROUPS) cause = OTHER_REASONS
  counts.set(cause, (counts.get(cause) ?? 0) + 1)
}
