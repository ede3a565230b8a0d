// Rules-editor preview and warnings. Check values: the chatter definition (≥ 3 activations in 60 s)
// and the ~80/15/5 priority split (EEMUA 191 / ISA-18.2 [common practice]); the flood threshold of
// shared/alarms/flood (> 10 alarms in 10 minutes, ISA-18.2 [common practice]).
import { describe, expect, it } from 'vitest'
import { firingSummary, prioritySpread, valueActivations } from '#shared/utils/rulePreview'
import type { Priority } from '#shared/alarms/vocabulary'

const HIGH_LIMIT = { comparison: 'above' as const, threshold: 10, deadband: 0, onDelayS: 0, offDelayS: 0 }

describe('value rule replay', () => {
  // A square wave crossing the limit every 10 s: raises on each rising edge.
  const times = Array.from({ length: 100 }, (_, i) => i)
  const values = times.map(t => (Math.floor(t / 10) % 2 === 1 ? 11 : 9))
  it('raises on each crossing without delays or deadband', () => {
    expect(valueActivations(times, values, HIGH_LIMIT)).toEqual([10, 30, 50, 70, 90])
  })
  it('an on-delay longer than each excursion never raises', () => {
    expect(valueActivations(times, values, { ...HIGH_LIMIT, onDelayS: 10 })).toEqual([])
  })
  it('a deadband wider than the swing keeps one activation', () => {
    expect(valueActivations(times, values, { ...HIGH_LIMIT, deadband: 2 })).toEqual([10])
  })
})

describe('chatter and flood warnings', () => {
  it('three activations inside 60 s chatter, two do not', () => {
    expect(firingSummary([0, 20, 59], 86_400)).toMatchObject({ chatter: true, maxInChatterWindow: 3, count: 3, perDay: 3 })
    expect(firingSummary([0, 20, 61], 86_400).chatter).toBe(false)
  })
  it('more than 10 in 10 minutes is a flood', () => {
    const eleven = Array.from({ length: 11 }, (_, i) => i * 50)
    expect(firingSummary(eleven, 7 * 86_400).flood).toBe(true)
    expect(firingSummary(eleven.slice(1), 7 * 86_400).flood).toBe(false)
  })
})

describe('priority spread', () => {
  it('80/15/5 is the usual split and raises no departure', () => {
    const rules: Priority[] = [...Array(16).fill('low'), ...Array(3).fill('medium'), 'high']
    expect(prioritySpread(rules).departures).toEqual([])
  })
  it('half the alarms at high or urgent is named', () => {
    const spread = prioritySpread(['urgent', 'high', 'low', 'low'])
    expect(spread.counts).toEqual({ low: 2, medium: 0, high: 2 })
    expect(spread.departures).toContain('high and urgent priority: 50% of 4 alarm rules, usually about 5%')
    expect(spread.departures.some(d => d.startsWith('low priority: 50%'))).toBe(true)
  })
})
