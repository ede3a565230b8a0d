import { describe, expect, it } from 'vitest'
import { MAX_FUTURE_SKEW_MS, parseSampleTime, validateSamples, valueProblem } from '../../../../shared/utils/sampleBatch'

const NOW = Date.UTC(2026, 5, 1, 12, 0, 0)
const clock = { nowMs: NOW }
const ranged = { rangeLow: 0, rangeHigh: 100 }
const known = () => ranged

describe('validateSamples clock-skew bound', () => {
  it('refuses a sample stamped more than the skew bound ahead of the receiving clock, naming time', () => {
    const { valid, rejected } = validateSamples([
      { tag: 'TI-101', time: NOW + MAX_FUTURE_SKEW_MS, value: 1 },
      { tag: 'TI-101', time: NOW + MAX_FUTURE_SKEW_MS + 1, value: 2 },
      { tag: 'TI-101', time: new Date(NOW + 3_600_000).toISOString(), value: 3 },
      { tag: 'TI-101', time: '9999-12-31T23:59:59Z', value: 4 },
    ], known, clock)
    expect(valid.map(v => v.value)).toEqual([1])
    expect(rejected.map(r => [r.index, r.field])).toEqual([[1, 'time'], [2, 'time'], [3, 'time']])
    expect(rejected[1]!.reason).toMatch(/60 min ahead/)
    expect(rejected[2]!.reason).toMatch(/days ahead/)
  })

  it('takes a configured allowance instead of the default', () => {
    expect(parseSampleTime(NOW + 2_000, { nowMs: NOW, maxFutureMs: 1_000 })).toMatch(/allowed: 1 s/)
    expect(parseSampleTime(NOW + 1_000, { nowMs: NOW, maxFutureMs: 1_000 })).toBe(NOW + 1_000)
  })
})

describe('parseSampleTime: no silent change of a time', () => {
  // Gregorian calendar: February 2026 has 28 days, 2028 is a leap year; ISO 8601 hours 00–23.
  it.each([
    ['2026-02-30T00:00:00Z', /not a real date/],
    ['2026-02-29T00:00:00Z', /not a real date/],
    ['2026-04-31T00:00:00Z', /not a real date/],
    ['2026-13-01T00:00:00Z', /not a real date/],
    ['2026-05-01T24:00:00Z', /not a real date/],
    ['2026-05-01T12:60:00Z', /not a real date/],
    ['2026-05-01T12:00:00+15:00', /offset beyond/],
    ['2026-05-01T12:00:00', /time-zone offset/],
    ['0001-01-01T00:00:00Z', /before 2000-01-01/],
    ['1970-01-01T00:00:00Z', /before 2000-01-01/],
    ['2999-01-01T00:00:00Z', /ahead of the receiving clock/],
    [1_780_000_000, /seconds sent instead of milliseconds/],
    [0, /before 2000-01-01/],
    [Number.NaN, /finite/],
  ])('%s is refused (%s)', (raw, reason) => {
    expect(parseSampleTime(raw, clock)).toMatch(reason)
  })
  it('real instants pass, leap day included', () => {
    expect(parseSampleTime('2028-02-29T00:00:00Z', { nowMs: Date.UTC(2028, 2, 1) })).toBe(Date.UTC(2028, 1, 29))
    expect(parseSampleTime('2026-05-01T14:00:00+02:00', clock)).toBe(Date.UTC(2026, 4, 1, 12))
  })
})

describe('valueProblem: physical bound of a ranged tag', () => {
  it('refuses values more than one span outside the range, keeps real excursions', () => {
    expect(valueProblem(1e308, ranged)).toMatch(/beyond the physical bound/)
    expect(valueProblem(-1e308, ranged)).toMatch(/beyond the physical bound/)
    expect(valueProblem(200.5, ranged)).toMatch(/refused outside -100–200/)
    expect(valueProblem(150, ranged)).toBeNull()
    expect(valueProblem(-100, ranged)).toBeNull()
    expect(valueProblem(Number.POSITIVE_INFINITY, ranged)).toBe('must be a finite number')
  })
})

describe('validateSamples: a tag code holding NUL', () => {
  // PostgreSQL text cannot hold U+0000 (manual, "Character Types" [from memory]): the sample is
  // refused on its own, naming tag, before its code reaches a query.
  it('refuses only that sample, without looking the code up', () => {
    const looked: string[] = []
    const { valid, rejected } = validateSamples([
      { tag: 'TI-101\u0000', time: NOW, value: 1 },
      { tag: 'TI-101', time: NOW, value: 2 },
    ], (code) => { looked.push(code); return ranged }, clock)
    expect(valid.map(v => v.value)).toEqual([2])
    expect(rejected).toEqual([{ index: 0, field: 'tag', reason: expect.stringContaining('NUL') }])
    expect(looked).toEqual(['TI-101'])
  })
})

describe('parseSampleTime: the site raw window', () => {
  it('refuses a time before the window start (already folded into the archive) and takes one at it', () => {
    const clock = { nowMs: Date.UTC(2026, 11, 4, 1), rawFromMs: Date.UTC(2026, 11, 2) }
    expect(parseSampleTime('2026-12-01T23:59:59Z', clock)).toMatch(/older than this site's raw window/)
    expect(parseSampleTime('2026-12-02T00:00:00Z', clock)).toBe(Date.UTC(2026, 11, 2))
  })
})
