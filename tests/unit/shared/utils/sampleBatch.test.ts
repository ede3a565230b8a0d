import { describe, expect, it } from 'vitest'
import { MAX_FUTURE_SKEW_MS, validateSamples } from '../../../../shared/utils/sampleBatch'

const NOW = Date.UTC(2026, 5, 1, 12, 0, 0)
const known = () => true

describe('validateSamples clock-skew bound', () => {
  it('refuses a live sample stamped more than the skew bound ahead of the receiving clock, naming time', () => {
    const { valid, rejected } = validateSamples([
      { tag: 'TI-101', time: NOW + MAX_FUTURE_SKEW_MS, value: 1 },
      { tag: 'TI-101', time: NOW + MAX_FUTURE_SKEW_MS + 1, value: 2 },
      { tag: 'TI-101', time: new Date(NOW + 3_600_000).toISOString(), value: 3 },
    ], known, { nowMs: NOW })
    expect(valid.map(v => v.value)).toEqual([1])
    expect(rejected.map(r => [r.index, r.field])).toEqual([[1, 'time'], [2, 'time']])
    expect(rejected[1]!.reason).toMatch(/60 min ahead/)
  })

  it('leaves history without a receiving clock (CSV import) unbounded within 2000–2100', () => {
    const { valid } = validateSamples([{ tag: 'TI-101', time: NOW + 3_600_000, value: 1 }], known)
    expect(valid).toHaveLength(1)
  })
})
