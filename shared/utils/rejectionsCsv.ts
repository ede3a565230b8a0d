import { csvRecord } from './csvField'
import type { LineRejection } from './csvSamples'

// One format for a file's rejected lines, whether the browser writes the listed ones or the server
// streams them all (POST /api/uploads/rejections): CRLF records, as RFC 4180 has them.
export const REJECTIONS_CSV_HEADER = `${csvRecord(['line', 'column', 'value', 'reason'])}\r\n`
export const rejectionCsvRow = (r: LineRejection) => `${csvRecord([r.line, r.column, r.value, r.reason])}\r\n`
