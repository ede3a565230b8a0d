import { describe, expect, it } from 'vitest'
import { csvTime, planColumns, recordToSamples, TIME_FORMAT_REASON, validatePending, type ColumnPlan } from '#shared/utils/csvSamples'

const LONG = ['time', 'tag', 'value', 'quality']
const longPlan = planColumns(LONG, { format: 'long', timeColumn: 'time', tagColumn: 'tag', valueColumn: 'value', qualityColumn: 'quality' }) as ColumnPlan
const widePlan = planColumns(['time', 'TI-101', 'TI-102'], { format: 'wide', timeColumn: 'time' }) as ColumnPlan
const known = (c: string) => (['TI-101', 'TI-102'].includes(c) ? { rangeLow: 0, rangeHigh: 100 } : undefined)
const clock = { nowMs: Date.UTC(2026, 5, 1) }

describe('planColumns', () => {
  it('maps names to indexes', () => {
    expect(longPlan.long).toEqual({ tag: 1, value: 2, quality: 3 })
    expect(widePlan.wide).toEqual([1, 2])
  })
  it('names the query field and the header when a column is missing', () => {
    const r = planColumns(LONG, { format: 'long', timeColumn: 'time', tagColumn: 'tag', valueColumn: 'reading' })
    expect(r).toEqual({ field: 'valueColumn', message: 'no column "reading" in the header (it has "time", "tag", "value", "quality")' })
    expect(planColumns(['time'], { format: 'wide', timeColumn: 'time' })).toMatchObject({ field: 'tagColumns' })
  })
})

describe('csvTime', () => {
  it('epoch ms, offsets and plant-local times', () => {
    expect(csvTime('1767225600000', 'Europe/London')).toEqual({ time: 1767225600000 })
    expect(csvTime('2026-07-01T12:00:00+02:00', 'Europe/London')).toEqual({ time: '2026-07-01T12:00:00+02:00' })
    // BST (UTC+1) on 1 July — IANA tz database, Rule EU.
    expect(csvTime('2026-07-01 12:00:00', 'Europe/London')).toEqual({ time: Date.UTC(2026, 6, 1, 11) })
  })
  it('refuses the skipped and the repeated hour with a reason naming the zone', () => {
    expect(csvTime('2026-03-29 01:30:00', 'Europe/London')).toEqual({ reason: expect.stringMatching(/does not exist in Europe\/London/) })
    expect(csvTime('2026-10-25 01:30:00', 'Europe/London')).toEqual({ reason: expect.stringMatching(/happens twice/) })
    expect(csvTime('', 'UTC')).toEqual({ reason: 'is empty' })
  })
  it('refuses a zone-less date that is not in the calendar instead of rolling it over (2026 is not a leap year)', () => {
    expect(csvTime('2026-02-30 00:00:00', 'UTC')).toEqual({ reason: expect.stringMatching(/not a real date/) })
    expect(csvTime('2026-02-29 00:00:00', 'UTC')).toEqual({ reason: expect.stringMatching(/not a real date/) })
    expect(csvTime('2028-02-29 00:00:00', 'UTC')).toEqual({ time: Date.UTC(2028, 1, 29) })
  })
})

describe('recordToSamples + validatePending', () => {
  it('long rows: good ones pass, bad ones are traced to line, column and raw value', () => {
    const rows = [
      ['2026-01-05 08:00:00', 'TI-101', '20.5', 'good'],
      ['2026-01-05 08:00:05', 'XX-999', '1', ''],
      ['2026-01-05 08:00:10', 'TI-101', 'high', ''],
      ['05/01/2026 08:00', 'TI-101', '1', ''],
      ['2026-01-05 08:00:20', 'TI-101', '2', 'excellent'],
      ['1767600000', 'TI-101', '3', ''],
    ]
    const pending = rows.flatMap((r, i) => recordToSamples(r, i + 2, longPlan, 'UTC').samples)
    const { valid, rejections } = validatePending(pending, known, clock)
    expect(valid).toEqual([{ index: 0, tag: 'TI-101', timeMs: Date.UTC(2026, 0, 5, 8), value: 20.5, quality: 0 }])
    expect(rejections.map(r => [r.line, r.column, r.value])).toEqual([
      [3, 'tag', 'XX-999'], [4, 'value', 'high'], [5, 'time', '05/01/2026 08:00'], [6, 'quality', 'excellent'], [7, 'time', '1767600000'],
    ])
    expect(rejections[0]!.reason).toBe('unknown tag code "XX-999" at this site')
    expect(rejections[2]!.reason).toBe(TIME_FORMAT_REASON)
    expect(rejections[4]!.reason).toMatch(/seconds/)
  })
  it('a file row stamped in the future or before 2000 is refused like live data, naming the time column', () => {
    const rows = [['2026-06-02T00:00:00Z', 'TI-101', '1', ''], ['1999-12-31T23:59:59Z', 'TI-101', '1', ''], ['2026-02-30T00:00:00Z', 'TI-101', '1', '']]
    const pending = rows.flatMap((r, i) => recordToSamples(r, i + 2, longPlan, 'UTC').samples)
    const { valid, rejections } = validatePending(pending, known, clock)
    expect(valid).toEqual([])
    expect(rejections.map(r => [r.line, r.column])).toEqual([[2, 'time'], [3, 'time'], [4, 'time']])
    expect(rejections.map(r => r.reason)).toEqual([expect.stringMatching(/ahead of the receiving clock/), expect.stringMatching(/before 2000-01-01/), expect.stringMatching(/not a real date/)])
  })
  it('wide rows: one sample per filled cell, blank cells skipped and counted', () => {
    const r = recordToSamples(['2026-01-05T08:00:00Z', '1.5', ''], 9, widePlan, 'UTC')
    expect(r.blank).toBe(1)
    expect(r.samples.map(s => [s.line, s.item.tag, s.item.value])).toEqual([[9, 'TI-101', 1.5]])
  })
  it('a row with the wrong number of fields is refused whole', () => {
    expect(recordToSamples(['2026-01-05T08:00:00Z', '1'], 4, widePlan, 'UTC').rejections)
      .toEqual([{ line: 4, column: '', value: '', reason: 'has 2 fields; the header has 3' }])
  })
  it('numbers must be whole numerals: no hex, no empty-as-zero', () => {
    const pending = [['t', '0x10'], ['t', ' ']].flatMap(([, v], i) =>
      recordToSamples(['2026-01-05T08:00:00Z', 'TI-101', v!, ''], i + 2, longPlan, 'UTC').samples)
    expect(validatePending(pending, known, clock).rejections.map(r => r.reason)).toEqual(['must be a finite number', 'must be a finite number'])
  })
})
