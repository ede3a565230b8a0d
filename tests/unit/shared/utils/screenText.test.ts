import { describe, expect, it } from 'vitest'
import { plainNumber, pValueText, tagDecimals, tagValue } from '../../../../shared/utils/numberText'
import { conditionText, measureReading } from '../../../../shared/utils/alarmText'
import { ageText, plantDateTime, trendTestText } from '../../../../shared/utils/timeText'

// The formatting rules of issue 12 items 5 and 8. Reference values are worked by hand from the
// rule each test names; time-zone offsets are from the IANA tz database [common practice].
describe('numbers on screens', () => {
  it('never uses scientific notation: small values in full, large ones grouped', () => {
    expect(plainNumber(0.000123, 3)).toBe('0.000123')
    expect(plainNumber(1.5e-7, 2)).toBe('0.00000015')
    expect(plainNumber(2_345_678)).toBe('2,345,678')
    expect(plainNumber(350.2468)).toBe('350.2')
    expect(plainNumber(0.5)).toBe('0.5')
    expect(plainNumber(0)).toBe('0')
    expect(plainNumber(null)).toBe('—')
    for (const v of [1e-9, 3.3e-5, 7.1e8, -4.2e-6]) expect(plainNumber(v)).not.toMatch(/e/i)
  })

  it('gives every value of a tag the same decimals, four significant figures of its range', () => {
    // 0–1.2 pu: span 1.2 → 3 decimals, so 1 and 0.9988 read "1.000" and "0.999".
    const pu = tagDecimals(0, 1.2)
    expect([tagValue(1, pu), tagValue(0.9988, pu)]).toEqual(['1.000', '0.999'])
    // 300–500 K: span 200 → 1 decimal.
    expect(tagValue(350.26, tagDecimals(300, 500))).toBe('350.3')
    expect(tagValue(-0.0001, 3)).toBe('0.000')
    expect(tagValue(null, 2)).toBe('—')
  })

  it('writes p-values below 0.001 as "< 0.001"', () => {
    expect([pValueText(0.0004), pValueText(0.04), pValueText(0.3149)]).toEqual(['< 0.001', '0.04', '0.31'])
  })
})

describe('alarm conditions in words', () => {
  it('reads the 0/1 early-warning flag as words, not as a number', () => {
    expect(conditionText({ measure: 'early_warning', comparison: 'above', threshold: 0.5 })).toBe('early-warning decision: slowing down')
    expect(measureReading('early_warning', 0)).toBe('no slowing down')
    expect(measureReading('early_warning', 1)).toBe('slowing down')
  })
  it('puts the engineering unit on value limits and writes fold horizons as durations', () => {
    expect(conditionText({ measure: 'value', comparison: 'above', threshold: 400, engineeringUnit: 'K' })).toBe('value above 400 K')
    expect(conditionText({ measure: 'fold_horizon', comparison: 'below', threshold: 1200 })).toBe('fold horizon below 20 min')
    expect(measureReading('fold_horizon', Number.POSITIVE_INFINITY)).toBe('no fold in view')
  })
})

describe('times on screens', () => {
  it('shows one year-month-day format on the plant clock with the zone named (London is UTC+0 in January, UTC+1 in July)', () => {
    expect(plantDateTime('2026-01-05T08:00:00Z', 'Europe/London')).toBe('2026-01-05 08:00:00 Europe/London')
    expect(plantDateTime('2026-07-01T08:00:00Z', 'Europe/London')).toBe('2026-07-01 09:00:00 Europe/London')
    expect(plantDateTime(null, 'UTC')).toBe('—')
  })
  it('writes ages beside times', () => {
    const now = Date.parse('2026-07-01T08:00:00Z')
    expect(ageText('2026-07-01T07:48:00Z', now)).toBe('12 min ago')
    expect(ageText('2026-07-01T05:55:00Z', now)).toBe('2 h 05 min ago')
    expect(ageText('2026-07-01T07:59:55Z', now)).toBe('just now')
    expect(ageText('2026-07-01T08:05:00Z', now)).toBe('in 5 min')
    // 7,199 s is 119.98 min: rounded once it is 2 h 00 min, not "1 h 60 min".
    expect(ageText(new Date(now - 7_199_000), now)).toBe('2 h 00 min ago')
  })
})

describe('alarm values in the tag\'s decimals (issue 12 item 5)', () => {
  // The tile's rule (tagDecimals: four significant figures of the instrument range), so the alarm
  // list, the alarm page and the chart limit read a tag's values as its tile does.
  it('writes a value limit and a reading with the tag\'s fixed decimals', () => {
    const bus = { engineeringUnit: 'pu', rangeLow: 0, rangeHigh: 1.2 }
    expect(conditionText({ measure: 'value', comparison: 'below', threshold: 0.75, ...bus })).toBe('value below 0.750 pu')
    expect([measureReading('value', 1, bus), measureReading('value', 0.9988, bus)]).toEqual(['1.000 pu', '0.999 pu'])
    // pH 0–14: span 14 → 2 decimals, as the tile's "7.37".
    expect(measureReading('value', 7.355_4, { engineeringUnit: 'pH', rangeLow: 0, rangeHigh: 14 })).toBe('7.36 pH')
  })
  it('leaves other measures and unit alarms (no range) to plain numbers', () => {
    expect(measureReading('variance', 0.000_057_5, { rangeLow: 0, rangeHigh: 14 })).toBe('0.0000575')
    expect(measureReading('value', 0.9146, { engineeringUnit: 'pu', rangeLow: null, rangeHigh: null })).toBe('0.9146 pu')
  })
})

describe('when a tile\'s trend tests ran (issue 12 item 5)', () => {
  // τ and p are recomputed every evaluateEvery samples (20, docs/science.md §S8.2 table): 10 min
  // for a 30 s tag, 40 s for a 2 s tag. The tile says when, so a still τ/p does not read as frozen.
  it('writes the last test\'s age and the interval', () => {
    const now = Date.parse('2026-07-01T08:00:00Z')
    expect(trendTestText('2026-07-01T07:56:00Z', 20 * 30, now)).toBe('tested 4 min ago, every 10 min')
    expect(trendTestText('2026-07-01T07:59:58Z', 20 * 2, now)).toBe('tested just now, every 40 s')
    expect(trendTestText(null, 600, now)).toBe('tested every 10 min')
  })
})
