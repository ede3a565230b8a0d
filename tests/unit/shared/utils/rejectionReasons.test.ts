import { describe, expect, it } from 'vitest'
import { countCause, MAX_REASON_GROUPS, OTHER_REASONS, rejectionCause } from '../../../../shared/utils/rejectionReasons'

// Grouping rule of issue 12 item 9 [common practice: an import report counts errors by kind and
// shows a few rows of each]. The reasons are the import's own words (shared/utils/sampleBatch.ts,
// csvSamples.ts, server/services/ingest/ingest.ts), quoted here as they read.
describe('rejectionCause', () => {
  it('leaves out the line\'s own cell, so one cause over many lines is one group', () => {
    const bound = (value: string, shown: string) => ({ value, reason: `${shown} is beyond the physical bound of this tag (range 0–1.2; refused outside -1.2–2.4)` })
    expect(rejectionCause(bound('500', '500'))).toBe('… is beyond the physical bound of this tag (range 0–1.2; refused outside -1.2–2.4)')
    // The cell "88.50" is quoted as the number 88.5.
    expect(rejectionCause(bound('88.50', '88.5'))).toBe(rejectionCause(bound('500', '500')))
    expect(rejectionCause({ value: '2026-03-29 01:30', reason: '2026-03-29 01:30 does not exist in Europe/London: the clocks went forward over it' }))
      .toBe('… does not exist in Europe/London: the clocks went forward over it')
  })
  it('leaves out a conflict\'s instant and readings', () => {
    const conflict = (at: string, stored: number, offered: number) => ({
      value: String(offered),
      reason: `conflicts with the reading already stored for TI-401 at ${at} (value ${stored}, quality 0; this one ${offered}, quality 0): the stored reading is kept`,
    })
    expect(rejectionCause(conflict('2025-08-04T13:00:00.000Z', 38.2, 39))).toBe('conflicts with the reading already stored for TI-401 at … (…): the stored reading is kept')
    expect(rejectionCause(conflict('2025-08-04T13:00:05.000Z', 38.3, 40))).toBe(rejectionCause(conflict('2025-08-04T13:00:00.000Z', 38.2, 39)))
  })
  it('keeps a quoted tag code: each unknown tag is its own cause (and its own workbench link)', () => {
    expect(rejectionCause({ value: 'XX-900', reason: 'unknown tag code "XX-900" at this site' })).toBe('unknown tag code "XX-900" at this site')
  })
})

describe('countCause', () => {
  it('counts every rejection by cause and, past the cap, the rest together', () => {
    const counts = new Map<string, number>()
    for (let i = 0; i < 400; i++) countCause(counts, { value: String(500 + i), reason: `${500 + i} is beyond the physical bound of this tag (range 0–1.2; refused outside -1.2–2.4)` })
    expect([...counts]).toEqual([['… is beyond the physical bound of this tag (range 0–1.2; refused outside -1.2–2.4)', 400]])
    for (let i = 0; i < MAX_REASON_GROUPS + 5; i++) countCause(counts, { value: `X-${i}`, reason: `unknown tag code "X-${i}" at this site` })
    expect(counts.size).toBe(MAX_REASON_GROUPS + 1)
    expect(counts.get(OTHER_REASONS)).toBe(6)
  })
})
