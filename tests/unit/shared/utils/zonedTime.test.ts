import { describe, expect, it } from 'vitest'
import { isTimeZone, parseWallClock, wallClockToUtc, zoneOffsetMs } from '#shared/utils/zonedTime'

const wall = (text: string) => {
  const ms = parseWallClock(text)
  if (ms === null) throw new Error(`not a wall-clock time: ${text}`)
  return ms
}
const utc = (text: string, zone: string) => {
  const r = wallClockToUtc(wall(text), zone)
  return r.ok ? new Date(r.utcMs).toISOString() : r.problem
}

describe('parseWallClock', () => {
  it('reads date-times with T or space, optional seconds and fraction', () => {
    expect(wall('2026-05-01 12:00')).toBe(Date.UTC(2026, 4, 1, 12, 0))
    expect(wall('2026-05-01T12:00:07.25')).toBe(Date.UTC(2026, 4, 1, 12, 0, 7, 250))
  })
  it.each(['2026-02-30 00:00', '2026-13-01 00:00', '2026-05-01 24:00', '01/05/2026 12:00', '2026-05-01', '2026-05-01T12:00Z'])(
    'refuses %s', text => expect(parseWallClock(text)).toBeNull())
})

describe('wallClockToUtc', () => {
  // Source: IANA tz database, file `europe`, Rule EU: summer time from the last Sunday of March
  // to the last Sunday of October, changing at 01:00 UTC (2026-03-29 and 2026-10-25).
  it('Europe/London: GMT in winter, BST in summer', () => {
    expect(utc('2026-01-15 12:00:00', 'Europe/London')).toBe('2026-01-15T12:00:00.000Z')
    expect(utc('2026-07-15 12:00:00', 'Europe/London')).toBe('2026-07-15T11:00:00.000Z')
  })
  it('Europe/London 2026-03-29: 01:00–01:59 local never happens (clocks 01:00 GMT → 02:00 BST)', () => {
    expect(utc('2026-03-29 00:59:59', 'Europe/London')).toBe('2026-03-29T00:59:59.000Z')
    expect(utc('2026-03-29 01:00:00', 'Europe/London')).toBe('nonexistent')
    expect(utc('2026-03-29 01:30:00', 'Europe/London')).toBe('nonexistent')
    expect(utc('2026-03-29 02:00:00', 'Europe/London')).toBe('2026-03-29T01:00:00.000Z')
  })
  it('Europe/London 2026-10-25: 01:00–01:59 local happens twice (clocks 02:00 BST → 01:00 GMT)', () => {
    expect(utc('2026-10-25 00:59:59', 'Europe/London')).toBe('2026-10-24T23:59:59.000Z')
    expect(utc('2026-10-25 01:00:00', 'Europe/London')).toBe('ambiguous')
    expect(utc('2026-10-25 01:59:59', 'Europe/London')).toBe('ambiguous')
    expect(utc('2026-10-25 02:00:00', 'Europe/London')).toBe('2026-10-25T02:00:00.000Z')
  })
  // Source: IANA tz database, file `northamerica`, Rule US (since 2007): second Sunday of March
  // 02:00 → 03:00, first Sunday of November 02:00 → 01:00 local (2026-03-08 and 2026-11-01).
  it('America/New_York 2026: gap on 03-08, overlap on 11-01', () => {
    expect(utc('2026-03-08 02:30', 'America/New_York')).toBe('nonexistent')
    expect(utc('2026-03-08 03:00', 'America/New_York')).toBe('2026-03-08T07:00:00.000Z')
    expect(utc('2026-11-01 01:30', 'America/New_York')).toBe('ambiguous')
    expect(utc('2026-11-01 02:00', 'America/New_York')).toBe('2026-11-01T07:00:00.000Z')
  })
  // Source: IANA tz database, file `australasia`, Rule AN (since 2008): summer time ends the
  // first Sunday of April at 03:00 local and starts the first Sunday of October at 02:00.
  it('Australia/Sydney 2026: overlap on 04-05, gap on 10-04 (southern hemisphere)', () => {
    expect(utc('2026-04-05 02:30', 'Australia/Sydney')).toBe('ambiguous')
    expect(utc('2026-04-05 03:00', 'Australia/Sydney')).toBe('2026-04-04T17:00:00.000Z')
    expect(utc('2026-10-04 02:30', 'Australia/Sydney')).toBe('nonexistent')
    expect(utc('2026-10-04 03:00', 'Australia/Sydney')).toBe('2026-10-03T16:00:00.000Z')
  })
  // Source: IANA tz database, file `asia`: India Standard Time is UTC+05:30 all year.
  it('Asia/Kolkata: a half-hour offset and no clock changes', () => {
    expect(utc('2026-03-29 01:30', 'Asia/Kolkata')).toBe('2026-03-28T20:00:00.000Z')
    expect(zoneOffsetMs('Asia/Kolkata', Date.UTC(2026, 9, 25))).toBe(5.5 * 3_600_000)
  })
  it('UTC is the identity', () => expect(utc('2026-10-25 01:30:00.5', 'UTC')).toBe('2026-10-25T01:30:00.500Z'))
})

describe('isTimeZone', () => {
  it.each([['Europe/London', true], ['UTC', true], ['Europe/Fenwick', false], ['GMT+25', false], ['', false]])('%s → %s',
    (name, ok) => expect(isTimeZone(name)).toBe(ok))
})
