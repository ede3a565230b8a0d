import type { LineRejection } from '../utils/csvSamples'
import type { ColumnGuess, CsvDelimiter } from '../utils/csvLayout'

/** What an import (or dry run) reports when it ends, or how far it got when it failed. */
export interface UploadSummary {
  dryRun: boolean
  /** Data rows read (header not counted). */
  rowsRead: number
  /** Samples that passed every check (stored + duplicates, or what a dry run would store). */
  valid: number
  stored: number
  duplicates: number
  /** Wide-format cells left blank: no reading for that tag at that time. */
  blankCells: number
  rejectedCount: number
  /** The first MAX_LISTED_REJECTIONS, in line order. */
  rejections: LineRejection[]
  /** Every rejection counted by its cause (shared/utils/rejectionReasons.ts), commonest first. */
  causes: { cause: string, count: number }[]
  /** Valid samples per tag code. */
  tags: Record<string, number>
  /** Batches written; each one its own transaction. */
  batchesCommitted: number
  durationMs: number
}

/** One line of the import's NDJSON response. */
export type UploadEvent =
  | { type: 'progress', rowsRead: number, stored: number, duplicates: number, rejectedCount: number }
  | { type: 'summary', summary: UploadSummary }
  /** message: for the person importing; reason: what stopped the read, alone. */
  | { type: 'error', message: string, reason: string, summary: UploadSummary }

/** POST /api/uploads/preview: the start of a file as the import would read it, with guesses. */
export interface UploadPreview {
  delimiter: CsvDelimiter
  header: string[]
  rows: string[][]
  /** The site's zone: the default for times written without an offset. */
  timeZone: string
  guess: ColumnGuess
  /** Which of the codes seen in the header or rows are tags of the site. */
  knownTags: string[]
}
