import type { Readable } from 'node:stream'
import { parse } from 'csv-parse'
import { MAX_RECORD_CHARS } from '#shared/schemas/upload'
import type { LineRejection } from '#shared/utils/csvSamples'

const UTF16LE_BOM = Buffer.from([0xFF, 0xFE])

/** A CSV's bytes as text, decoded as the import's parser decodes them: UTF-16 LE after its byte-order mark, else UTF-8. */
export function csvTextOf(bytes: Buffer): string {
  return bytes.subarray(0, 2).equals(UTF16LE_BOM) ? bytes.subarray(2).toString('utf16le') : bytes.toString('utf8')
}

export interface CsvRecord { record: string[], info: { lines: number } }

/**
 * A CSV byte stream (the request body) as records, read one at a time so the file is never held
 * whole: while the consumer awaits a database write, csv-parse's buffer fills, pipe() stops
 * reading the socket, and TCP slows the sender. Records csv-parse cannot read are skipped and
 * collected in `unreadable` with their line.
 */
export function openCsvSource(body: Readable, delimiter = ',') {
  const parser = parse({
    // relax_quotes: a stray quote inside a field ("x"y) stays text for the row checks to refuse,
    // instead of opening a quoted field that would swallow the lines after it.
    delimiter, info: true, bom: true, relax_column_count: true, relax_quotes: true, skip_empty_lines: true,
    skip_records_with_error: true, max_record_size: MAX_RECORD_CHARS,
  })
  const unreadable: LineRejection[] = []
  let fatal: Error | undefined
  parser.on('skip', (err: Error & { lines?: number, code?: string }) => {
    if (fatal) return
    if (err.code === 'CSV_MAX_RECORD_SIZE' || err.code === 'CSV_QUOTE_NOT_CLOSED') {
      // After an unclosed quote csv-parse cannot find the next record boundary, and what follows
      // would be lost unreported: stop feeding it, let the records before drain, then fail.
      fatal = new Error(`a quoted field opened before line ${err.lines} is never closed (${err.message})`)
      body.unpipe(parser)
      body.resume()
      setImmediate(() => parser.end())
      return
    }
    unreadable.push({ line: err.lines ?? 0, column: '', value: '', reason: `unreadable CSV: ${err.message}` })
  })
  // pipe(), not pipeline(): on an early answer the body must be drained, not the socket destroyed.
  const fail = (err: Error) => parser.destroy(err)
  // An interrupted upload arrives as an error too (server/utils/limitedBody.ts).
  body.on('error', fail)
  body.pipe(parser)
  const records = parser[Symbol.asyncIterator]() as AsyncIterator<CsvRecord>
  return {
    unreadable,
    next: async (): Promise<CsvRecord | undefined> => {
      const r = await records.next()
      if (!r.done) return r.value
      if (fatal) throw fatal
      return undefined
    },
    /** Stops parsing and reads the rest of the body into nothing, so the client gets our answer. */
    discard() {
      body.unpipe(parser)
      body.resume()
      parser.destroy()
    },
  }
}
export type CsvSource = ReturnType<typeof openCsvSource>
