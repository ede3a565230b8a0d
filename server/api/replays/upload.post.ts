import { ADVISORY_CAUTION } from '#shared/alarms/vocabulary'
import { replayUploadQuerySchema } from '#shared/schemas/replay'
import type { UploadSummary } from '#shared/types/upload'

/** Rejected lines listed in the answer; the count covers all of them. */
const LISTED_REJECTIONS = 20

// Body: a historian CSV (text/csv), its columns read as the upload page reads them. The readings
// are kept for this replay only (replay_samples): the plant's history is never touched. Answer:
// the queued replay and what of the file was read and refused.
export default defineEventHandler(async (event) => {
  const user = await requireCapability(event, 'configure')
  const query = await validQuery(event, replayUploadQuerySchema)
  const db = useDb()
  const found = await findTagSettings(db, query.tagId)
  if (!found) throw createError({ statusCode: 400, message: `tagId: tag ${query.tagId} not found` })
  const { source, plan } = await openPlannedCsv(event, query)
  const collector = replayFileCollector(found.tag.code)
  let summary: UploadSummary | undefined
  const read = importCsvRecords(db, {
    source, plan, siteId: found.tag.siteId, timeZone: query.timeZone ?? found.timeZone, dryRun: false, store: collector.store,
  })
  for await (const line of read) {
    if (line.type === 'error') throw createError({ statusCode: 400, message: `body: stopped after ${line.summary.rowsRead} rows: ${line.reason}` })
    if (line.type === 'summary') summary = line.summary
  }
  const file = collector.samples()
  const n = file.timesMs.length
  if (n < 2) {
    const first = summary!.rejections[0]
    throw createError({
      statusCode: 400,
      message: `body: the file gives ${n} reading${n === 1 ? '' : 's'} of ${found.tag.code} in ${summary!.rowsRead} rows; a replay needs at least 2`
        + (first ? ` (line ${first.line}, ${first.column || 'record'}: ${first.reason})` : ''),
    })
  }
  const [fromMs, toMs] = [file.timesMs[0]!, file.timesMs[n - 1]!]
  const eventMs = query.eventTime?.getTime()
  if (eventMs !== undefined && (eventMs < fromMs || eventMs > toMs)) {
    throw createError({
      statusCode: 400,
      message: `eventTime: must lie within the file, between ${new Date(fromMs).toISOString()} and ${new Date(toMs).toISOString()}`,
    })
  }
  const { rejections, ...counts } = summary!
  const replay = await db.transaction(async (tx) => {
    const created = await createFileReplay(tx, { ...query, file }, user.id)
    await recordReplayJob(tx, created.id, await enqueueReplay(tx, created.id))
    await writeAudit(tx, {
      userId: user.id, action: 'replay.create', target: `replay ${created.id}`, address: clientAddress(event),
      detail: { id: created.id, tagId: query.tagId, source: 'upload', readings: n, ...counts, eventTime: query.eventTime, note: query.note },
    })
    return created
  })
  setResponseStatus(event, 201)
  return {
    id: replay.id, state: replay.state, advisory: ADVISORY_CAUTION,
    file: {
      rowsRead: counts.rowsRead, readings: n, duplicates: counts.duplicates, rejectedCount: counts.rejectedCount,
      rejections: rejections.slice(0, LISTED_REJECTIONS),
    },
  }
})
