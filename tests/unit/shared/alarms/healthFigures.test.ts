import { describe, expect, it } from 'vitest'
import { alarmSystemHealth, type HealthAlarm } from '../../../../shared/alarms/health'
import { healthFigures } from '../../../../shared/alarms/healthFigures'

// Targets as ISA-18.2 / IEC 62682 and EEMUA 191 state them (docs/science.md §S7.4) [from memory]:
// ~1 alarm per 10 min very likely acceptable, ~2 manageable; flood > 10 per 10 min; < 1 % of
// periods in flood; top ten ≈ 1 %, 5 % at most; shelving time-limited.
const MIN = 60_000
const T0 = Date.UTC(2026, 2, 2)
const HOUR = { from: T0, to: T0 + 60 * MIN }
let nextId = 1
const one = (ruleId: number, at: number, alarmClass: 'alarm' | 'alert' = 'alarm'): HealthAlarm => ({
  id: nextId++, ruleId, ruleName: `rule ${ruleId}`, priority: 'low', alarmClass, raisedAt: at, closedAt: at + MIN,
  events: [{ at, event: 'activate', fromState: 'normal', toState: 'unacknowledged' }],
})
const byKey = (alarms: HealthAlarm[]) => Object.fromEntries(healthFigures(alarmSystemHealth(alarms, HOUR)).map(f => [f.key, f]))

describe('health figures against their targets', () => {
  it('6 alarms in an hour (1 per 10 min) meets the acceptable rate; 12 (2 per 10 min) is only manageable; 18 misses', () => {
    const spread = (n: number) => Array.from({ length: n }, (_, i) => one(i + 1, T0 + i * (60 * MIN / n)))
    expect(byKey(spread(6)).averagePer10Min).toMatchObject({ value: 1, assessment: 'meets', source: 'EEMUA 191; ISA-18.2 / IEC 62682' })
    expect(byKey(spread(12)).averagePer10Min).toMatchObject({ value: 2, assessment: 'near' })
    expect(byKey(spread(18)).averagePer10Min).toMatchObject({ value: 3, assessment: 'misses' })
  })

  it('11 alarms in one ten-minute period is a flood: peak misses ≤ 10, one of six periods in flood misses < 1 %', () => {
    const f = byKey(Array.from({ length: 11 }, (_, i) => one(i + 1, T0 + i * 1000)))
    expect(f.peakPer10Min).toMatchObject({ value: 11, assessment: 'misses' })
    expect(f.floodShare!.value).toBeCloseTo(1 / 6, 12)
    expect(f.floodShare!.assessment).toBe('misses')
    // Every alarm is its own rule: the ten most frequent carry 10 of 11.
    expect(f.topTenShare!.value).toBeCloseTo(10 / 11, 12)
    expect(f.topTenShare!.assessment).toBe('misses')
  })

  it('alerts are reported apart and never scored against the alarm targets', () => {
    const f = byKey(Array.from({ length: 30 }, (_, i) => one(i + 1, T0 + i * 1000, 'alert')))
    expect(f.averagePer10Min).toMatchObject({ value: 0, assessment: 'meets' })
    expect(f.alertsPer10Min).toMatchObject({ value: 5, assessment: null })
  })
})
