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

  it('shows an annunciated alarm at once, an alert as at least warning, but never over bad quality', () => {
    const base = { latestTimeMs: now, samplePeriodS: 1, nowMs: now }
    const steady = { status: 'steady' as const, reason: '' }
    expect(tileStatus({ ...base, stored: steady, openAlarm: { alarmClass: 'alarm', name: 'R-100 reactor temperature high' } }))
      .toEqual({ status: 'alarm', reason: 'R-100 reactor temperature high' })
    expect(tileStatus({ ...base, stored: steady, openAlarm: { alarmClass: 'alert', name: 'slowing down' } }).status).toBe('warning')
    expect(tileStatus({ ...base, stored: { status: 'bad quality', reason: 'stuck' }, openAlarm: { alarmClass: 'alarm', name: 'x' } }).status).toBe('bad quality')
  })
})
