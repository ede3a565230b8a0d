import { Readable } from 'node:stream'
import { uploadImportQuerySchema } from '#shared/schemas/upload'
import { REJECTIONS_CSV_HEADER, rejectionCsvRow } from '#shared/utils/rejectionsCsv'

// Body: the CSV file, with the import's column query. Answer: every line the import's checks
// refuse, as CSV (line, column, value, reason), streamed as the file is read; nothing is stored
// (a dry run). The import's summary lists the first 1,000; a file with more gets them all here.
// A conflict with a reading already stored is found only by the insert, so it is listed by the
// import itself, not here.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'engineer')
  const query = await validQuery(event, uploadImportQuerySchema)
  const db = useDb()
  const site = await requireUploadSite(db, query.siteId)
  const { source, plan } = await openPlannedCsv(event, query)
  const found: string[] = []
  async function* csv() {
    yield REJECTIONS_CSV_HEADER
    const read = importCsvRecords(db, {
      source, plan, siteId: site.id, timeZone: query.timeZone ?? site.timeZone, dryRun: true,
      onReject: r => found.push(rejectionCsvRow(r)),
    })
    for await (const line of read) {
      // Rejections gather between progress lines (every 50,000 rows): the memory held stays bounded.
      if (found.length) yield found.splice(0).join('')
      if (line.type === 'error') yield rejectionCsvRow({ line: line.summary.rowsRead + 1, column: '', value: '', reason: `the read stopped: ${line.reason}` })
    }
  }
  setResponseHeaders(event, { 'content-type': 'text/csv; charset=utf-8', 'cache-control': 'no-store' })
  return sendStream(event, Readable.from(csv()))
})
