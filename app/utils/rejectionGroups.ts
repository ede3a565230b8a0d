import type { LineRejection } from '#shared/utils/csvSamples'
import { csvRecord } from '#shared/utils/csvField'

export interface RejectionGroup {
  reason: string
  count: number
  /** The first few lines with this reason, in line order. */
  examples: LineRejection[]
}

/**
 * Rejected lines grouped by reason, commonest first: a file with one bad column rejects every
 * line for the same reason, and 400 identical rows hide the one line that failed otherwise.
 */
export function groupRejections(rejections: readonly LineRejection[], examplesPerGroup = 3): RejectionGroup[] {
  const groups = new Map<string, RejectionGroup>()
  for (const r of rejections) {
    const group = groups.get(r.reason) ?? { reason: r.reason, count: 0, examples: [] }
    group.count++
    if (group.examples.length < examplesPerGroup) group.examples.push(r)
    groups.set(r.reason, group)
  }
  return [...groups.values()].sort((a, b) => b.count - a.count)
}

/** The listed rejections as CSV, one row per line, for a spreadsheet or the file's owner. */
export function rejectionsCsv(rejections: readonly LineRejection[]): string {
  const rows = [csvRecord(['line', 'column', 'value', 'reason']), ...rejections.map(r => csvRecord([r.line, r.column, r.value, r.reason]))]
  return `${rows.join('\r\n')}\r\n`
}
