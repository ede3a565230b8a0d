import { describe, expect, it } from 'vitest'
import { formatDuration } from '#shared/utils/duration'

// Check values are arithmetic on the span (derived): 7,170 s = 119.5 min, which rounds to 120 min.
describe('formatDuration', () => {
  it.each([
    [40, '40 s'], [720, '12 min'], [900, '15 min'], [3_900, '1 h 05 min'], [7_500, '2 h 05 min'],
    [90_000, '1 d 1 h'], [273_600, '3 d 4 h'], [-90, '−2 min'], [-120, '−2 min'],
  ])('%i s → %s', (s, text) => expect(formatDuration(s)).toBe(text))

  it('rounds the span before splitting it: 7,170 s is 2 h 00 min, never 1 h 60 min or 1 h 59 min', () => {
    expect(formatDuration(7_170)).toBe('2 h 00 min')
    expect(formatDuration(3_570)).toBe('1 h 00 min')
    expect(formatDuration(86_370)).toBe('1 d 0 h')
  })

  it('says "unbounded" for an infinite span and a dash for no value', () => {
    expect(formatDuration(Number.POSITIVE_INFINITY)).toBe('unbounded')
    expect(formatDuration(Number.NaN)).toBe('—')
  })
})
