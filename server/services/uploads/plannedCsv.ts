import { createError, type H3Event } from 'h3'
import { csvEncodingProblem } from '#shared/utils/csvLayout'
import { planColumns } from '#shared/utils/csvSamples'
import type { CsvDelimiter, CsvFormat } from '#shared/utils/csvLayout'
import { limitedBodyStream } from '../../utils/limitedBody'
import { openCsvSource } from './csvSource'

/**
 * The request body as a CSV stream whose header has been read and matched to the columns the
 * query names. A file that cannot be read that far is refused here, naming the field: the body
 * (empty, unreadable header, wrong encoding, too large) or the column that is not in the header.
 */
export async function openPlannedCsv(event: H3Event, query: {
  delimiter?: CsvDelimiter, format: CsvFormat, timeColumn: string, tagColumn?: string, valueColumn?: string, qualityColumn?: string,
  tagColumns?: string[]
}) {
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
  return { source, plan }
}
