import { describe, expect, it } from 'vitest'
import { CALENDAR_MESSAGE, dbId, isImpossibleCalendarDate, MAX_DB_ID, textField, timeField, zonedTimeField } from '../../../../shared/schemas/fields'
import { csvEncodingProblem } from '../../../../shared/utils/csvLayout'

describe('row ids stay inside PostgreSQL integer', () => {
  // PostgreSQL manual, "Numeric Types": integer is -2147483648 to +2147483647 [from memory].
  it('accepts 1 and 2^31 − 1, as number or text', () => {
    expect(dbId().parse('1')).toBe(1)
    expect(dbId().parse(2147483647)).toBe(MAX_DB_ID)
    expect(MAX_DB_ID).toBe(2 ** 31 - 1)
  })
  it.each(['2147483648', '9223372036854775808', '1e20', 2 ** 53, '0', '-1', '1.5', 'abc'])('refuses %s', (raw) => {
    expect(dbId('site').safeParse(raw).success).toBe(false)
  })
  it('names the row in the message', () => {
    expect(dbId('site').safeParse('2147483648').error?.issues[0]?.message).toBe('must be a site id (at most 2147483647)')
  })
})

describe('text fields refuse NUL', () => {
  // PostgreSQL manual, "Character Types": the character with code zero cannot be stored [from memory].
  it('refuses U+0000 anywhere, keeps other text and trimming', () => {
    expect(textField().trim().safeParse('a\u0000b').error?.issues[0]?.message).toContain('NUL')
    expect(textField().trim().parse('  Reactor ü  ')).toBe('Reactor ü')
  })
})

describe('times stay within four-digit years', () => {
  // ISO 8601-1:2019 §5.2.2: years are four digits; wider years only by agreement [from memory].
  it.each(['10000-01-01', '+010000-01-01T00:00:00Z', 'not a time', ''])('refuses %s', (raw) => {
    expect(timeField().safeParse(raw).success).toBe(false)
  })
  it('accepts 9999-12-31 and a normal offset time', () => {
    expect(timeField().parse('9999-12-31T23:59:59Z').getUTCFullYear()).toBe(9999)
    expect(timeField().parse('2026-05-01T12:00:00+02:00').toISOString()).toBe('2026-05-01T10:00:00.000Z')
  })
})

describe('zoned times name their offset', () => {
  // ISO 8601-1:2019 §5.3.4: a local time with no UTC offset does not name an instant [from memory].
  it.each(['2026-05-01T12:00:00', '2026-05-01 12:00', '2026-05-01'])('refuses %s', (raw) => {
    expect(zonedTimeField().safeParse(raw).error?.issues[0]?.message).toMatch(/time-zone offset/)
    // Refinements chained after it (the shift log's window) never see the unparsed string.
    expect(zonedTimeField().refine(d => d.getTime() > 0).safeParse(raw).error?.issues.map(i => i.message)).toEqual([expect.stringMatching(/time-zone offset/)])
  })
  it.each([['2026-05-01T12:00:00Z', '2026-05-01T12:00:00.000Z'], ['2026-05-01T14:00:00+02:00', '2026-05-01T12:00:00.000Z'], ['2026-05-01T07:00-0500', '2026-05-01T12:00:00.000Z']])('reads %s', (raw, iso) => {
    expect(zonedTimeField().parse(raw).toISOString()).toBe(iso)
  })
})

describe('times name days the calendar has', () => {
  // Gregorian calendar: 30 days in April, 28 in February of a common year, 29 in a leap year
  // (divisible by 4, not by 100 unless by 400: 2000 leap, 2100 common) [common practice].
  it.each(['2026-02-30T00:00:00Z', '2026-02-29', '2026-04-31T12:00:00+02:00', '2100-02-29T00:00:00Z', '2026-13-01', '2026-00-10'])('refuses %s', (raw) => {
    const result = timeField().safeParse(raw)
    expect(result.success).toBe(false)
    expect(result.error!.issues[0]!.message).toBe(CALENDAR_MESSAGE)
    expect(zonedTimeField().safeParse(raw).success).toBe(false)
  })
  it('reads the real ones, leap days included', () => {
    expect(timeField().parse('2028-02-29T00:00:00Z').toISOString()).toBe('2028-02-29T00:00:00.000Z')
    expect(timeField().parse('2000-02-29').toISOString()).toBe('2000-02-29T00:00:00.000Z')
    expect(timeField().parse('2026-04-30T23:59:59Z').toISOString()).toBe('2026-04-30T23:59:59.000Z')
    expect(isImpossibleCalendarDate(1_780_000_000_000)).toBe(false)
  })
})

describe('a UTF-16 CSV is told apart from UTF-8', () => {
  // UTF-16LE "Unicode text" with its byte-order mark FF FE (Unicode Standard §23.8 [from memory]),
  // decoded as UTF-8 the way the preview route reads it.
  it('flags UTF-16 LE and BE, passes UTF-8 with or without BOM', () => {
    const asUtf8 = (b: Buffer) => b.toString('utf8')
    expect(csvEncodingProblem(asUtf8(Buffer.from('\uFEFFtime,TI-101\n', 'utf16le')))).toContain('UTF-16')
    expect(csvEncodingProblem(asUtf8(Buffer.from('\uFEFFtime,TI-101\n', 'utf16le').swap16()))).toContain('UTF-16')
    expect(csvEncodingProblem(asUtf8(Buffer.from('\uFEFFtime,TI-101\n', 'utf8')))).toBeNull()
    expect(csvEncodingProblem('time;TI-101\n2026-01-01 00:00:00;401,5\n')).toBeNull()
  })
})
