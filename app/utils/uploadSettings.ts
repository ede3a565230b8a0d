import type { CsvFormat } from '#shared/utils/csvLayout'
import type { UploadPreview } from '#shared/types/upload'

/** What the mapping form edits; turned into the import route's query on submit. */
export interface UploadSettings {
  format: CsvFormat
  delimiter: string
  timeColumn: string
  tagColumn: string
  valueColumn: string
  qualityColumn: string
  tagColumns: string[]
  timeZone: string
}

/** Starts from the server's guesses; for the wide layout, ticks the columns named after the site's tags. */
export function settingsFromPreview(preview: UploadPreview): UploadSettings {
  const g = preview.guess
  return {
    format: g.format, delimiter: preview.delimiter, timeColumn: g.timeColumn,
    tagColumn: g.tagColumn ?? '', valueColumn: g.valueColumn ?? '', qualityColumn: g.qualityColumn ?? '',
    tagColumns: preview.header.filter(c => c !== g.timeColumn && preview.knownTags.includes(c)),
    timeZone: preview.timeZone,
  }
}

export function importQuery(s: UploadSettings, siteId: number, dryRun: boolean): Record<string, string> {
  const columns: Record<string, string> = s.format === 'long'
    ? { tagColumn: s.tagColumn, valueColumn: s.valueColumn, ...(s.qualityColumn ? { qualityColumn: s.qualityColumn } : {}) }
    : { tagColumns: s.tagColumns.join(',') }
  return {
    siteId: String(siteId), format: s.format, delimiter: s.delimiter, timeColumn: s.timeColumn,
    timeZone: s.timeZone, dryRun: dryRun ? '1' : '0', ...columns,
  }
}

/** Why the import can't start yet, or null when the mapping is complete. */
export function mappingProblem(s: UploadSettings): string | null {
  if (s.format === 'wide' && s.tagColumns.length === 0) return 'Tick at least one tag column.'
  if (s.format === 'long' && (!s.tagColumn || !s.valueColumn)) return 'Choose the tag and value columns.'
  return null
}
