import { describe, expect, it } from 'vitest'
import { detectDelimiter, guessColumns } from '#shared/utils/csvLayout'

const known = new Set(['TI-101', 'TI-102', 'FI-103'])
const isKnown = (c: string) => known.has(c)

describe('detectDelimiter', () => {
  it.each([
    ['time,tag,value\n2026-01-01 00:00,TI-101,1.5\n', ','],
    ['time;tag;value\n2026-01-01 00:00;TI-101;1,5\n', ';'],
    ['time\tTI-101\tTI-102\n2026-01-01 00:00\t1\t2\n', '\t'],
    ['time|tag|value\n1767225600000|TI-101|3\n', '|'],
    // A comma inside quotes must not out-vote the real delimiter.
    ['time;tag;note\n2026-01-01 00:00;TI-101;"a, b, c, d"\n', ';'],
  ])('%j → %j', (text, delimiter) => expect(detectDelimiter(text)).toBe(delimiter))
})

describe('guessColumns', () => {
  it('long format from header names, quality included', () => {
    expect(guessColumns(['Timestamp', 'Tag', 'Value', 'Quality'], [['2026-01-01 00:00', 'TI-101', '1', 'good']], isKnown)).toEqual({
      format: 'long', timeColumn: 'Timestamp', tagColumn: 'Tag', valueColumn: 'Value', qualityColumn: 'Quality', tagColumns: [],
    })
  })
  it('wide format when the header is time plus tag codes', () => {
    expect(guessColumns(['time', 'TI-101', 'TI-102'], [['2026-01-01 00:00', '1', '2']], isKnown)).toEqual({
      format: 'wide', timeColumn: 'time', tagColumns: ['TI-101', 'TI-102'],
    })
  })
  it('finds the tag column by its values when the header does not name it', () => {
    const rows = [['2026-01-01 00:00', 'TI-101', '1'], ['2026-01-01 00:00', 'FI-103', '2']]
    expect(guessColumns(['when', 'sensor', 'value'], rows, isKnown)).toMatchObject({ format: 'long', timeColumn: 'when', tagColumn: 'sensor' })
  })
})
