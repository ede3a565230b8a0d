import { describe, expect, it } from 'vitest'
import { auditCsv } from '../../../../shared/utils/auditCsv'
import { csvField } from '../../../../shared/utils/csvField'
import { auditChanges } from '../../../../shared/utils/auditChanges'

describe('audit CSV (RFC 4180)', () => {
  it('quotes fields with commas, quotes or line breaks and doubles quotes (RFC 4180 §2.6–2.7)', () => {
    expect(csvField('plain')).toBe('plain')
    expect(csvField('a,b')).toBe('"a,b"')
    expect(csvField('say "hi"')).toBe('"say ""hi"""')
    expect(csvField('two\nlines')).toBe('"two\nlines"')
  })
  it('defuses spreadsheet formulas (OWASP CSV injection) [common practice]', () => {
    expect(csvField('=HYPERLINK("x")')).toBe('"\'=HYPERLINK(""x"")"')
    expect(csvField('+1')).toBe('\'+1')
    expect(csvField('@SUM(A1)')).toBe('\'@SUM(A1)')
  })
  it('writes a header and CRLF-terminated records (RFC 4180 §2.1)', () => {
    const csv = auditCsv([{ id: 7, at: '2026-03-02T12:00:00.000Z', userEmail: 'a@b.example', action: 'user.update', target: 'c@d.example', address: '10.0.0.1', detail: { before: { role: 'operator' } } }])
    expect(csv).toBe('id,time_utc,user,action,target,address,detail\r\n7,2026-03-02T12:00:00.000Z,a@b.example,user.update,c@d.example,10.0.0.1,"{""before"":{""role"":""operator""}}"\r\n')
  })
})

describe('audit changes', () => {
  it('lists only the fields whose value changed', () => {
    expect(auditChanges({ before: { role: 'operator', name: 'A' }, after: { role: 'engineer', name: 'A' } }))
      .toEqual([{ field: 'role', before: 'operator', after: 'engineer' }])
    expect(auditChanges({ before: null, after: { name: 'X' } })).toEqual([{ field: 'name', before: undefined, after: 'X' }])
    expect(auditChanges({ id: 3 })).toEqual([])
  })
})
