// Guesses for the upload preview: how the file is delimited and which column means what. They are
// only starting values for the mapping form; the import uses what the engineer confirms.

export const CSV_DELIMITERS = [',', ';', '\t', '|'] as const
export type CsvDelimiter = typeof CSV_DELIMITERS[number]

/** The delimiter that splits the first lines into the same number (>1) of fields most often. */
export function detectDelimiter(text: string): CsvDelimiter {
  const lines = text.split(/\r?\n/).filter(l => l.trim()).slice(0, 20)
  let best: { delimiter: CsvDelimiter, score: number } = { delimiter: ',', score: 0 }
  for (const delimiter of CSV_DELIMITERS) {
    // Quoted text may hold any delimiter; strip it before counting.
    const counts = lines.map(l => l.replace(/"[^"]*"/g, '').split(delimiter).length - 1)
    const first = counts[0] ?? 0
    if (first === 0) continue
    const score = counts.filter(c => c === first).length * 1000 + first
    if (score > best.score) best = { delimiter, score }
  }
  return best.delimiter
}

export type CsvFormat = 'long' | 'wide'
export interface ColumnGuess {
  format: CsvFormat
  timeColumn: string
  tagColumn?: string
  valueColumn?: string
  qualityColumn?: string
  /** Wide format: the columns holding one tag each. */
  tagColumns: string[]
}

const NAMES = {
  time: /^(time|timestamp|date ?time|datetime|date|ts|time ?\(.*\)|time_?utc|local ?time)$/i,
  tag: /^(tag|tag ?name|tag_name|tag ?code|code|point|signal|name)$/i,
  value: /^(value|val|reading|measurement|pv)$/i,
  quality: /^(quality|q|status|qual)$/i,
}

/**
 * Long format when the header names a tag column and a value column (or when a column's first
 * values are tag codes the site knows); otherwise wide, with every non-time column a tag.
 */
export function guessColumns(header: readonly string[], rows: readonly string[][], isKnownTag: (code: string) => boolean): ColumnGuess {
  const find = (re: RegExp) => header.find(h => re.test(h.trim()))
  const timeColumn = find(NAMES.time) ?? header[0] ?? ''
  const byValues = header.find((h, i) =>
    h !== timeColumn && rows.length > 0 && rows.every(r => r[i] !== undefined && isKnownTag(r[i]!.trim())))
  const tagColumn = find(NAMES.tag) ?? byValues
  const valueColumn = find(NAMES.value)
  if (tagColumn && valueColumn)
    return { format: 'long', timeColumn, tagColumn, valueColumn, qualityColumn: find(NAMES.quality), tagColumns: [] }
  return { format: 'wide', timeColumn, tagColumns: header.filter(h => h !== timeColumn) }
}

/**
 * Why a CSV's decoded text cannot be trusted, or null. Files are read as UTF-8, or as UTF-16 LE
 * when they start with its byte-order mark (what csv-parse's `bom` option recognises, and what
 * spreadsheet programs write as "Unicode text"). Other UTF-16 files — big-endian, or without the
 * mark — read as UTF-8 hold a NUL beside every ASCII character, or start with two replacement
 * characters (FE FF). Guessing the encoding could store wrong tag codes silently, so such a file
 * is refused with what to do instead.
 */
export function csvEncodingProblem(text: string): string | null {
  if (text.startsWith('\uFFFD\uFFFD') || text.includes('\u0000'))
    return 'the file is not UTF-8 text (it looks UTF-16 big-endian or without a byte-order mark): save it as CSV UTF-8 and send it again'
  return null
}
