import { describe, expect, it } from 'vitest'
import { seriesCsv } from '#shared/utils/seriesCsv'

describe('seriesCsv', () => {
  const time = [1_767_225_600, 1_767_225_660, 1_767_225_720]
  const columns = [{ name: 'value, K', values: [300.5, null, 301] }, { name: 'ar1', values: [0.5, null, null] }]

  it('writes ISO UTC times, full precision, empty cells for gaps, quoted headers with commas', () => {
    expect(seriesCsv(time, columns)).toBe(
      'time_utc,"value, K",ar1\n2026-01-01T00:00:00.000Z,300.5,0.5\n2026-01-01T00:02:00.000Z,301,\n')
  })

  it('keeps only the zoomed range', () => {
    expect(seriesCsv(time, columns, [time[1]!, time[2]!]).trim().split('\n')).toHaveLength(2)
  })
})
