// One CSV record → the {tag, time, value, quality} items that POST /api/ingest takes, so uploaded
// history passes the same per-sample rules (validateSamples) as live data.
import type { CsvFormat } from './csvLayout'
import { validateSamples, type SampleClock, type TagBounds, type ValidSample } from './sampleBatch'
import { parseWallClock, wallClockToUtc } from './zonedTime'

export interface ColumnPlan {
  header: string[]
  time: number
  long?: { tag: number, value: number, quality?: number }
  wide?: number[]
}

type Field = 'time' | 'tag' | 'value' | 'quality'
/** A sample waiting for its batch's tag lookup: where it came from, and the raw text of each field. */
export interface PendingSample {
  line: number
  columns: Record<Field, string>
  raw: Record<Field, string>
  item: { tag: string, time: number | string, value: number | string | undefined, quality: number | string | undefined }
}
/** line is 1-based and counts the header as line 1, as a text editor shows it. */
export interface LineRejection { line: number, column: string, value: string, reason: string }

/** Column names → indexes; a message naming the query field when a name is not in the header. */
export function planColumns(header: string[], mapping: {
  format: CsvFormat, timeColumn: string, tagColumn?: string, valueColumn?: string, qualityColumn?: string, tagColumns?: string[]
}): ColumnPlan | { field: string, message: string } {
  const problem = (field: string, name: string) => ({
    field, message: `no column ${JSON.stringify(name)} in the header (it has ${header.map(h => JSON.stringify(h)).join(', ')})`,
  })
  const indexOf = (name: string) => header.indexOf(name)
  const time = indexOf(mapping.timeColumn)
  if (time < 0) return problem('timeColumn', mapping.timeColumn)
  if (mapping.format === 'long') {
    const named = {
      tagColumn: mapping.tagColumn!, valueColumn: mapping.valueColumn!,
      ...(mapping.qualityColumn ? { qualityColumn: mapping.qualityColumn } : {}),
    }
    for (const [field, name] of Object.entries(named)) if (indexOf(name) < 0) return problem(field, name)
    const quality = mapping.qualityColumn ? indexOf(mapping.qualityColumn) : undefined
    return { header, time, long: { tag: indexOf(named.tagColumn), value: indexOf(named.valueColumn), quality } }
  }
  const names = mapping.tagColumns ?? header.filter((_, i) => i !== time)
  const missing = names.find(n => indexOf(n) < 0)
  if (missing !== undefined) return problem('tagColumns', missing)
  if (names.length === 0) return { field: 'tagColumns', message: 'the wide format needs at least one tag column besides the time column' }
  return { header, time, wide: names.map(indexOf) }
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/
const EPOCH = /^-?\d+(\.\d+)?$/
// The shape of a zone-less wall-clock time, whether or not its fields make a real date.
const WALL_CLOCK_SHAPE = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?$/
export const TIME_FORMAT_REASON = 'must be an ISO 8601 date-time (e.g. 2026-05-01 12:00:00, read in the chosen time zone, '
  + 'or with an offset such as Z or +01:00) or epoch milliseconds'

/** A time cell → epoch ms (or an ISO string with offset, left to validateSamples) or why not. */
export function csvTime(cell: string, timeZone: string): { time: number | string } | { reason: string } {
  if (!cell) return { reason: 'is empty' }
  if (EPOCH.test(cell)) return { time: Number(cell) }
  const wall = parseWallClock(cell)
  if (wall === null && WALL_CLOCK_SHAPE.test(cell)) return { reason: `${cell} is not a real date and time (day, month, hour, minute or second out of range)` }
  if (wall === null) return { time: cell }
  const utc = wallClockToUtc(wall, timeZone)
  if (utc.ok) return { time: utc.utcMs }
  return {
    reason: utc.problem === 'nonexistent'
      ? `${cell} does not exist in ${timeZone}: the clocks went forward over it`
      : `${cell} happens twice in ${timeZone} (the clocks went back); export it with a UTC offset to say which`,
  }
}

const numberOrRaw = (cell: string) => (NUMBER.test(cell) ? Number(cell) : cell || undefined)
const qualityOf = (cell: string) => (cell === '' ? undefined : /^\d+$/.test(cell) ? Number(cell) : cell.toLowerCase())

/**
 * Splits one record into pending samples. Wide files leave a cell blank where a tag has no reading
 * at that time (tags are sampled at different rates), so blank wide cells are skipped, not refused.
 */
export function recordToSamples(record: string[], line: number, plan: ColumnPlan, timeZone: string) {
  const samples: PendingSample[] = []
  const rejections: LineRejection[] = []
  let blank = 0
  const cell = (i: number | undefined) => (i === undefined ? '' : (record[i] ?? '').trim())
  const name = (i: number | undefined) => (i === undefined ? '' : plan.header[i]!)
  if (record.length !== plan.header.length) {
    rejections.push({ line, column: '', value: '', reason: `has ${record.length} fields; the header has ${plan.header.length}` })
    return { samples, rejections, blank }
  }
  const time = csvTime(cell(plan.time), timeZone)
  if ('reason' in time) {
    rejections.push({ line, column: name(plan.time), value: cell(plan.time), reason: time.reason })
    return { samples, rejections, blank }
  }
  const add = (tagAt: number | undefined, tag: string, valueAt: number, qualityAt: number | undefined) => samples.push({
    line,
    columns: { time: name(plan.time), tag: name(tagAt ?? valueAt), value: name(valueAt), quality: name(qualityAt ?? valueAt) },
    raw: { time: cell(plan.time), tag, value: cell(valueAt), quality: cell(qualityAt) },
    item: { tag, time: time.time, value: numberOrRaw(cell(valueAt)), quality: qualityOf(cell(qualityAt)) },
  })
  if (plan.long) add(plan.long.tag, cell(plan.long.tag), plan.long.value, plan.long.quality)
  for (const i of plan.wide ?? []) {
    if (cell(i) === '') blank++
    else add(undefined, plan.header[i]!.trim(), i, undefined)
  }
  return { samples, rejections, blank }
}

/** validateSamples over a batch, with each refusal traced back to its line and column. */
export function validatePending(pending: readonly PendingSample[], tagOf: (code: string) => TagBounds | undefined, clock: SampleClock) {
  const { valid, rejected } = validateSamples(pending.map(p => p.item), tagOf, clock)
  const rejections: LineRejection[] = rejected.map(({ index, field, reason }) => {
    const p = pending[index]!
    const f = field as Field
    // validateSamples words these for a gateway's JSON; say them the way a CSV file reads.
    if (f === 'time' && reason.startsWith('must be ISO')) reason = TIME_FORMAT_REASON
    if (f === 'tag' && p.raw.tag) reason = `unknown tag code ${JSON.stringify(p.raw.tag)} at this site`
    return { line: p.line, column: p.columns[f] ?? '', value: p.raw[f] ?? '', reason }
  })
  return { valid: valid as ValidSample[], rejections }
}
