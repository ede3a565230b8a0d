import { describe, expect, it } from 'vitest'
import { incidentEventsCsv, type TimelineEntry } from '../../../../shared/utils/incidentEventsCsv'

const entry = (over: Partial<TimelineEntry>): TimelineEntry => ({
  at: '2026-07-01T11:00:00.000Z', kind: 'alarm event', alarmId: 7, name: 'TI-101 high', priority: 'high', alarmClass: 'alarm',
  event: 'acknowledge', fromState: 'unacknowledged', toState: 'acknowledged', who: 'Olu Mensah', text: '', value: 401.5, ...over,
})

describe('incident events as CSV', () => {
  it('RFC 4180: CRLF line ends, a field with a comma or quote is quoted and its quotes doubled', () => {
    const csv = incidentEventsCsv([entry({ text: 'checked, "by hand"' })], 'Europe/London')
    const lines = csv.split('\r\n')
    expect(lines).toHaveLength(3)
    expect(lines[2]).toBe('')
    expect(lines[1]).toContain('"checked, ""by hand"""')
  })

  it('names the plant zone in the header and writes the wall-clock time in it (British Summer Time is UTC+1 in July)', () => {
    const [header, row] = incidentEventsCsv([entry({})], 'Europe/London').split('\r\n')
    expect(header).toContain('plant time (Europe/London)')
    expect(row!.split(',').slice(0, 2)).toEqual(['2026-07-01T11:00:00.000Z', '2026-07-01 12:00:00'])
  })

  it('a comment a spreadsheet would run as a formula starts with an apostrophe (OWASP CSV injection) [common practice]', () => {
    const row = incidentEventsCsv([entry({ text: '=HYPERLINK("x")' })], 'UTC').split('\r\n')[1]!
    expect(row).toContain(`"'=HYPERLINK(""x"")"`)
    expect(row.endsWith(',401.5')).toBe(true)
  })
})
