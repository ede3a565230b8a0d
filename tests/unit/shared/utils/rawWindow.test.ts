import { describe, expect, it } from 'vitest'
import { rawWindowStartMs } from '#shared/utils/rawWindow'

describe('rawWindowStartMs', () => {
  it('starts at the UTC midnight of the day the window reaches back to, so at least the window is kept', () => {
    const now = Date.parse('2026-12-04T01:30:00Z')
    expect(new Date(rawWindowStartMs(now, 2)).toISOString()).toBe('2026-12-02T00:00:00.000Z')
    expect(now - rawWindowStartMs(now, 2)).toBeGreaterThanOrEqual(2 * 86_400_000)
    expect(now - rawWindowStartMs(now, 2)).toBeLessThan(3 * 86_400_000)
  })

  it('at UTC midnight exactly, keeps exactly the window', () => {
    const now = Date.parse('2026-12-04T00:00:00Z')
    expect(new Date(rawWindowStartMs(now, 30)).toISOString()).toBe('2026-11-04T00:00:00.000Z')
  })
})
