// RFC 4180 §2 (fields with commas, quotes or line breaks are enclosed in double quotes; a quote
// inside is doubled) and the OWASP "CSV Injection" guidance (prefix cells starting with
// = + - @ tab or CR with a single quote) [common practice].
import { describe, expect, it } from 'vitest'
import { csvField, csvRecord } from '../../../../shared/utils/csvField'

describe('csvField', () => {
  it('quotes a field holding a comma, a quote or a line break and doubles its quotes (RFC 4180 §2 rules 6–7)', () => {
    expect(csvField('a,b')).toBe('"a,b"')
    expect(csvField('say "hi"')).toBe('"say ""hi"""')
    expect(csvField('two\nlines')).toBe('"two\nlines"')
    expect(csvField('plain')).toBe('plain')
  })
  it('writes text that a spreadsheet would run as a formula as text (OWASP CSV injection)', () => {
    for (const lead of ['=', '+', '-', '@', '\t', '\r']) expect(csvField(`${lead}1+1`).startsWith(`'`) || csvField(`${lead}1+1`).startsWith(`"'`)).toBe(true)
    expect(csvField('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`)
  })
  it('leaves numbers as numbers, negative ones too, and empties null', () => {
    expect(csvRecord([-1.5, 0, null, undefined, 'x'])).toBe('-1.5,0,,,x')
  })
})
