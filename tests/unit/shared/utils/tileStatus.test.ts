import { describe, expect, it } from 'vitest'
import { tileStatus } from '#shared/utils/tileStatus'

const now = Date.UTC(2026, 4, 1, 12)
describe('tileStatus', () => {
  it('is "no data" once samples stop for 3 sample periods (here 3 × 30 s)', () => {
    const stored = { status: 'warning' as const, reason: 'AR1 rising' }
    expect(tileStatus({ stored, latestTimeMs: now - 89_000, samplePeriodS: 30, nowMs: now }).status).toBe('warning')
    expect(tileStatus({ stored, latestTimeMs: now - 91_000, samplePeriodS: 30, nowMs: now })).toEqual({ status: 'no data', reason: 'no sample for 91 s (limit 90 s)' })
  })

  it('keeps a floor of 15 s for fast tags posted in batches', () => {
    expect(tileStatus({ stored: null, latestTimeMs: now - 10_000, samplePeriodS: 1, nowMs: now }).status).toBe('steady')
    expect(tileStatus({ stored: null, latestTimeMs: now - 16_000, samplePeriodS: 1, nowMs: now }).status).toBe('no data')
  })

  it('says "analysis pending" before the pipeline has judged the tag, and "no data" without samples', () => {
    expect(tileStatus({ stored: null, latestTimeMs: now, samplePeriodS: 2, nowMs: now })).toEqual({ status: 'steady', reason: 'analysis pending' })
    expect(tileStatus({ stored: null, latestTimeMs: null, samplePeriodS: 2, nowMs: now }).status).toBe('no data')
  })
})
