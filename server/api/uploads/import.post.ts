import { Readable } from 'node:stream'
import { uploadImportQuerySchema } from '#shared/schemas/upload'

// Body: the CSV file itself, streamed (never buffered). Answer: NDJSON lines, progress then a
// summary, so a million-row file shows how far it has got.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer')
  const query = await validQuery(event, uploadImportQuerySchema)
  const db = useDb()
  const site = await requireUploadSite(db, query.siteId)
  const { source, plan } = await openPlannedCsv(event, query)
  const timeZone = query.timeZone ?? site.timeZone
  const address = clientAddress(event)

  async function* ndjson() {
    for await (const line of importCsvRecords(db, { source, plan, siteId: site.id, timeZone, dryRun: query.dryRun })) {
      if (line.type !== 'progress' && !query.dryRun) {
        const { rejections: _listed, ...counts } = line.summary
        await writeAudit(db, {
          userId: user.id, action: 'samples.upload', target: `site:${site.code}`, address,
          detail: { ...counts, format: query.format, timeZone, ...(line.type === 'error' ? { error: line.message } : {}) },
        }).catch(err => console.error('[uploads:import] audit', err))
      }
      yield `${JSON.stringify(line)}\n`
    }
  }
  setResponseHeaders(event, { 'content-type': 'application/x-ndjson; charset=utf-8', 'cache-control': 'no-store' })
  return sendStream(event, Readable.from(ndjson()))
})
