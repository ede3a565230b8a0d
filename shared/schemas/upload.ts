import { z } from 'zod'
import { dbId, textField } from './fields'
import { CSV_DELIMITERS } from '../utils/csvLayout'
import { isTimeZone } from '../utils/zonedTime'

/** Preview body: the start of the file, cut by the browser (File.slice). */
export const PREVIEW_MAX_BYTES = 256 * 1024
export const PREVIEW_ROWS = 20
/**
 * Largest file one import request may carry. The import streams, so this bounds one request's
 * work, not memory: about 25 million long-form lines of ~40 bytes. Longer histories go in several
 * files; importing again is safe (stored samples count as duplicates).
 */
export const MAX_UPLOAD_BYTES = 1024 * 1024 * 1024
/** Samples validated and written together; each batch is its own transaction. */
export const UPLOAD_BATCH_SAMPLES = 5_000
/** Rejections listed one by one; the count goes on past this. */
export const MAX_LISTED_REJECTIONS = 1_000
/** Longest accepted CSV record (characters): one runaway quoted field can't fill the memory. */
export const MAX_RECORD_CHARS = 64 * 1024

const siteId = dbId('site')
const delimiter = z.enum(CSV_DELIMITERS, { errorMap: () => ({ message: 'must be one of , ; | or a tab' }) }).optional()
const column = textField().trim().min(1, 'must name a column of the header').max(200)

const flag = z.enum(['0', '1', 'true', 'false'], { errorMap: () => ({ message: 'must be 1 or 0' }) }).optional()
  .transform(v => v === '1' || v === 'true')

export const uploadPreviewQuerySchema = z.object({
  siteId,
  delimiter,
  // 1 when the body is the whole file; otherwise its last line may be cut short and is dropped.
  complete: flag,
})

/** How a CSV file's columns are read: the query of every route that takes a historian file. */
export const csvColumnsQueryShape = {
  delimiter,
  format: z.enum(['long', 'wide'], { errorMap: () => ({ message: 'must be long or wide' }) }),
  timeColumn: column,
  tagColumn: column.optional(),
  valueColumn: column.optional(),
  qualityColumn: column.optional(),
  // Wide format: comma-separated tag columns; all but the time column when left out.
  tagColumns: textField().trim().optional()
    .transform(s => (s ? s.split(',').map(c => c.trim()).filter(Boolean) : undefined)),
  timeZone: textField().trim().refine(isTimeZone, 'must be an IANA time-zone name such as Europe/London').optional(),
}

/** The long format names its tag and value columns. */
export function refineCsvColumns(q: { format: 'long' | 'wide', tagColumn?: string, valueColumn?: string }, ctx: z.RefinementCtx) {
  if (q.format !== 'long') return
  for (const key of ['tagColumn', 'valueColumn'] as const)
    if (!q[key]) ctx.addIssue({ code: 'custom', path: [key], message: 'is required for the long format' })
}

export const uploadImportQuerySchema = z.object({ siteId, ...csvColumnsQueryShape, dryRun: flag }).superRefine(refineCsvColumns)
export type UploadImportQuery = z.infer<typeof uploadImportQuerySchema>
