import { createError } from 'h3'
import { eq } from 'drizzle-orm'
import { sites } from '../../db/schema'
import { MAX_LISTED_REJECTIONS, UPLOAD_BATCH_SAMPLES } from '#shared/schemas/upload'
import { recordToSamples, validatePending, type ColumnPlan, type LineRejection, type PendingSample } from '#shared/utils/csvSamples'
import { countCause } from '#shared/utils/rejectionReasons'
import type { RejectedSample, ValidSample } from '#shared/utils/sampleBatch'
import type { UploadEvent, UploadSummary } from '#shared/types/upload'
import type { CsvSource } from './csvSource'
import type { Db } from '../../utils/db'
import { storeUploadedSamples, tagIdsByCode } from '../ingest/ingest'
import type { SiteTag } from '../ingest/ingest'
import { siteSampleClock } from '../ingest/sampleClock'

/** A progress line after this many rows: often enough for a bar, rare enough to be free. */
export const PROGRESS_EVERY_ROWS = 50_000

async function findSite(db: Db, id: number) {
  const [site] = await db.select().from(sites).where(eq(sites.id, id))
  return site
}

/** The site a file is for, or a 400 naming siteId: every upload route starts here. */
export async function requireUploadSite(db: Db, id: number) {
  const site = await findSite(db, id)
  if (!site) throw createError({ statusCode: 400, message: `siteId: no site with id ${id}` })
  return site
}

const emptySummary = (dryRun: boolean): UploadSummary => ({
  dryRun, rowsRead: 0, valid: 0, stored: 0, duplicates: 0, blankCells: 0, rejectedCount: 0, rejections: [], causes: [], tags: {},
  batchesCommitted: 0, durationMs: 0,
})

/** Where a batch of valid samples goes: the plant's history, unless a caller keeps them elsewhere. */
export type SampleSink = (samples: ValidSample[], tagIds: Map<string, SiteTag>) =>
  Promise<{ accepted: number, duplicates: number, conflicts: RejectedSample[] }>

/**
 * Reads the records after the header, validates them in batches and (unless a dry run) stores
 * each batch before reading on — into the samples table, or into `store` (a replay's file).
 * Yields progress, then a summary — or, when something fails mid-file, an error with the summary
 * of what was already committed.
 */
export async function* importCsvRecords(db: Db, input: {
  source: CsvSource, plan: ColumnPlan, siteId: number, timeZone: string, dryRun: boolean, store?: SampleSink
  /** Every rejection as it is found (the summary lists only the first MAX_LISTED_REJECTIONS). */
  onReject?: (r: LineRejection) => void
}): AsyncGenerator<UploadEvent> {
  const { source, plan, siteId, timeZone, dryRun } = input
  const store: SampleSink = input.store ?? ((samples, ids) => storeUploadedSamples(db, samples, ids))
  const started = Date.now()
  const summary = emptySummary(dryRun)
  const tagIds = new Map<string, SiteTag>()
  const unknownTags = new Set<string>()
  // Every rejection is counted by its cause, not only the listed ones.
  const causes = new Map<string, number>()
  let pending: PendingSample[] = []

  const reject = (r: LineRejection) => {
    input.onReject?.(r)
    summary.rejectedCount++
    countCause(causes, r)
    if (summary.rejections.length < MAX_LISTED_REJECTIONS) summary.rejections.push(r)
  }
  const takeUnreadable = () => {
    for (const r of source.unreadable.splice(0)) {
      summary.rowsRead++
      reject(r)
    }
  }
  const flush = async () => {
    const batch = pending
    pending = []
    const newCodes = [...new Set(batch.map(p => p.item.tag))].filter(c => c && !tagIds.has(c) && !unknownTags.has(c))
    if (newCodes.length) {
      const found = await tagIdsByCode(db, siteId, newCodes)
      for (const code of newCodes) {
        if (found.has(code)) tagIds.set(code, found.get(code)!)
        else unknownTags.add(code)
      }
    }
    // Files carry history: the same clock bounds as live data refuse times in the future and
    // before the site's raw window.
    const { valid, rejections } = validatePending(batch, code => tagIds.get(code), await siteSampleClock(db, siteId))
    rejections.forEach(reject)
    for (const s of valid) summary.tags[s.tag] = (summary.tags[s.tag] ?? 0) + 1
    summary.valid += valid.length
    if (dryRun || valid.length === 0) return
    const { accepted, duplicates, conflicts } = await store(valid, tagIds)
    for (const c of conflicts) {
      const p = batch[c.index]!
      const field = c.field === 'tag' ? 'tag' : 'value'
      reject({ line: p.line, column: p.columns[field], value: p.raw[field], reason: c.reason })
    }
    summary.valid -= conflicts.length
    summary.stored += accepted
    summary.duplicates += duplicates
    summary.batchesCommitted++
  }
  const finish = () => {
    summary.rejections.sort((a, b) => a.line - b.line)
    summary.causes = [...causes].map(([cause, count]) => ({ cause, count })).sort((a, b) => b.count - a.count)
    summary.durationMs = Date.now() - started
    return summary
  }

  try {
    let nextProgress = PROGRESS_EVERY_ROWS
    for (let rec = await source.next(); rec; rec = await source.next()) {
      takeUnreadable()
      summary.rowsRead++
      const { samples, rejections, blank } = recordToSamples(rec.record, rec.info.lines, plan, timeZone)
      rejections.forEach(reject)
      summary.blankCells += blank
      pending.push(...samples)
      if (pending.length >= UPLOAD_BATCH_SAMPLES) await flush()
      if (summary.rowsRead >= nextProgress) {
        nextProgress += PROGRESS_EVERY_ROWS
        yield { type: 'progress', rowsRead: summary.rowsRead, stored: summary.stored, duplicates: summary.duplicates, rejectedCount: summary.rejectedCount }
      }
    }
    takeUnreadable()
    await flush()
    yield { type: 'summary', summary: finish() }
  }
  catch (err) {
    console.error('[uploads:import]', err)
    source.discard()
    const message = `Stopped after ${summary.rowsRead} rows: ${(err as Error).message}. `
      + `${summary.batchesCommitted} ${summary.batchesCommitted === 1 ? 'batch' : 'batches'} (${summary.stored} new samples) committed; importing the file again is safe, stored samples count as duplicates.`
    yield { type: 'error', message, reason: (err as Error).message, summary: finish() }
  }
}
