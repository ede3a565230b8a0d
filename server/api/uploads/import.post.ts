import { Readable } from 'node:stream'
import { uploadImportQuerySchema } from '#shared/schemas/upload'
import { csvEncodingProblem } from '#shared/utils/csvLayout'
import { planColumns } from '#shared/utils/csvSamples'

// Body: the CSV file itself, streamed (never buffered). Answer: NDJSON lines, progress then a
// summary, so a million-row file shows how far it has got.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer')
  const query = await validQuery(event, uploadImportQuerySchema)
  const db = useDb()
  const site = await findSite(db, query.siteId)
  if (!site) throw createError({ statusCode: 400, message: `siteId: no site with id ${query.siteId}` })
  const source = openCsvSource(limitedBodyStream(event), query.delimiter)
  const refuse = (message: string, statusCode = 400): never => {
    source.discard()
    throw createError({ statusCode, message })
  }
  const first = await source.next().catch((err: Error & { statusCode?: number }) =>
    err.statusCode === 413 ? refuse(err.message, 413) : refuse(`body: the header line can't be read: ${err.message}`))
  const header = first?.record.map(h => h.trim()) ?? refuse('body: the file is empty (no header line)')
  const encoding = csvEncodingProblem(header.join(','))
  if (encoding) refuse(`body: ${encoding}`, 415)
  const planned = planColumns(header, query)
  const plan = 'message' in planned ? refuse(`${planned.field}: ${planned.message}`) : planned
  const timeZone = query.timeZone ?? site.timeZone
  const address = clientAddress(event)

  async function* ndjson() {
    for await (const line of importCsvRecords(db, { source, plan, siteId: site!.id, timeZone, dryRun: query.dryRun })) {
      if (line.type !== 'progress' && !query.dryRun) {
        const { rejections: _listed, ...counts } = line.summary
        await writeAudit(db, {
          userId: user.id, action: 'samples.upload', target: `site:${site!.code}`, address,
          detail: { ...counts, format: query.format, timeZone, ...(line.type === 'error' ? { error: line.message } : {}) },
        }).catch(err => console.error('[uploads:import] audit', err))
      }
      yield `${JSON.stringify(line)}\n`
    }
  }
  setResponseHeaders(event, { 'content-type': 'application/x-ndjson; charset=utf-8', 'cache-control': 'no-store' })
  return sendStream(event, Readable.from(ndjson()))
})
