import type { LineRejection } from '#shared/utils/csvSamples'
import { REJECTIONS_CSV_HEADER, rejectionCsvRow } from '#shared/utils/rejectionsCsv'
import { OTHER_REASONS, rejectionCause } from '#shared/utils/rejectionReasons'

export interface RejectionGroup {
  /** What went wrong, without any one line's cell (rejectionCause). */
  reason: string
  /** Rejections with this cause in the whole file, when the import counted them; else among the listed. */
  count: number
  /** The first few lines with this reason, in line order. */
  examples: LineRejection[]
}

/**
 * Rejected lines grouped by cause, commonest first: a file with one bad column rejects every
 * line for the same cause, and 400 identical rows hide the one line that failed otherwise.
 * `causes` (the import's count over every rejected line) gives the counts and the causes whose
 * lines were past the listed ones; without it the listed lines are counted.
 */
export function groupRejections(
  rejections: readonly LineRejection[],
  causes?: readonly { cause: string, count: number }[],
  examplesPerGroup = 3,
): RejectionGroup[] {
  const groups = new Map<string, RejectionGroup>()
  for (const c of causes ?? []) groups.set(c.cause, { reason: c.cause, count: c.count, examples: [] })
  for (const r of rejections) {
    // Past MAX_REASON_GROUPS causes the import counted the rest together.
    const own = rejectionCause(r)
    const cause = causes && !groups.has(own) && groups.has(OTHER_REASONS) ? OTHER_REASONS : own
    const group = groups.get(cause) ?? { reason: cause, count: 0, examples: [] }
    if (!causes) group.count++
    if (group.examples.length < examplesPerGroup) group.examples.push(r)
    groups.set(cause, group)
  }
  return [...groups.values()].sort((a, b) => b.count - a.count)
}

/** The listed rejections as CSV, one row per line, for a spreadsheet or the file's owner. */
export function rejectionsCsv(rejections: readonly LineRejection[]): string {
  return REJECTIONS_CSV_HEADER + rejections.map(rejectionCsvRow).join('')
}
