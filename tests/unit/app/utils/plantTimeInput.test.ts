// Offsets from the IANA tz database (Europe/London: GMT in winter, BST = UTC+1 from the last
// Sunday of March 01:00 UTC; Rule EU) [common practice].
import { describe, expect, it } from 'vitest'
import { plantTimeFromInput, plantTimeToInput } from '../../../../app/utils/plantTimeInput'

describe('plant time typed in a filter', () => {
  it('reads year-month-day on the plant wall clock', () => {
    expect(plantTimeFromInput('2026-12-02 14:00', 'Europe/London')).toEqual({ iso: '2026-12-02T14:00:00.000Z' })
    expect(plantTimeFromInput('2026-07-01 09:30', 'Europe/London')).toEqual({ iso: '2026-07-01T08:30:00.000Z' })
    expect(plantTimeFromInput('  ', 'Europe/London')).toEqual({ iso: undefined })
  })
  it('names what is wrong instead of guessing', () => {
    expect(plantTimeFromInput('12/02/2026 14:00', 'UTC')).toHaveProperty('error')
    expect(plantTimeFromInput('2026-02-30 10:00', 'UTC')).toHaveProperty('error')
    expect(plantTimeFromInput('2026-03-29 01:30', 'Europe/London')).toEqual({ error: '2026-03-29 01:30 does not exist in Europe/London (the clocks went forward)' })
    expect(plantTimeFromInput('2026-10-25 01:30', 'Europe/London')).toEqual({ error: '2026-10-25 01:30 happens twice in Europe/London (the clocks went back)' })
  })
  it('shows an instant back as minutes on the wall clock', () => {
    expect(plantTimeToInput('2026-07-01T08:30:00.000Z', 'Europe/London')).toBe('2026-07-01 09:30')
    expect(plantTimeToInput(undefined, 'UTC')).toBe('')
  })
})
