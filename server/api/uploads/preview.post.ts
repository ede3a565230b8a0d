import { parse } from 'csv-parse/sync'
import { PREVIEW_ROWS, uploadPreviewQuerySchema } from '#shared/schemas/upload'
import { csvEncodingProblem, detectDelimiter, guessColumns } from '#shared/utils/csvLayout'
import type { UploadPreview } from '#shared/types/upload'

// Body: the first bytes of the file as text (the browser cuts it with File.slice), at most
// PREVIEW_MAX_BYTES: the read stops there with a 413 (middleware/bodyLimits.ts).
export default defineEventHandler(async (event) => {
  await requireRole(event, 'engineer')
  const query = await validQuery(event, uploadPreviewQuerySchema)
  const db = useDb()
  const site = await requireUploadSite(db, query.siteId)
  const bytes = (await readRawBody(event, false)) ?? Buffer.alloc(0)
  const text = csvTextOf(bytes)
  const encoding = csvEncodingProblem(text)
  if (encoding) throw createError({ statusCode: 415, message: `body: ${encoding}` })
  // A slice may end mid-line; drop its partial last line unless it is all there is.
  const cut = text.lastIndexOf('\n')
  const whole = query.complete || cut <= 0 ? text : text.slice(0, cut)
  if (!whole.trim()) throw createError({ statusCode: 400, message: 'body: the file is empty' })
  const delimiter = query.delimiter ?? detectDelimiter(whole)
  const records: string[][] = parse(whole, {
    delimiter, bom: true, relax_column_count: true, skip_empty_lines: true, skip_records_with_error: true, to: PREVIEW_ROWS + 1,
  })
  const [first = [], ...rows] = records
  const header = first.map(h => h.trim())
  const candidates = [...new Set([...header, ...rows.flat()].map(c => c.trim()).filter(Boolean))]
  const known = await tagIdsByCode(db, site.id, candidates)
  const isKnownTag = (code: string) => known.has(code.trim())
  const preview: UploadPreview = {
    delimiter, header, rows, timeZone: site.timeZone,
    guess: guessColumns(header, rows, isKnownTag),
    knownTags: [...known.keys()].sort(),
  }
  return preview
})
