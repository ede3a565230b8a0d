import { describe, expect, it } from 'vitest'
import {
  alarmSystemHealth, chatterIndex, mostWithinSpan, setAside, staleAlarms, TEN_MINUTES_MS,
  type HealthAlarm, type HealthEvent, type Period,
} from '../../../../shared/alarms/health'
import type { AlarmClass, Priority } from '../../../../shared/alarms/vocabulary'

// Every expected value below follows by counting from the definitions in docs/science.md §S7.4
// (ISA-18.2-2016 / IEC 62682 / EEMUA 191 as summarised there), not from running the code.
const MIN = 60_000
const HOUR = 60 * MIN
const DAY = 24 * HOUR
const T0 = Date.UTC(2026, 2, 2, 0, 0, 0)
const HOUR_PERIOD: Period = { from: T0, to: T0 + HOUR }

let nextId = 1
const activate = (at: number): HealthEvent => ({ at, event: 'activate', fromState: 'normal', toState: 'unacknowledged' })
const ev = (at: number, event: string, fromState: HealthEvent['fromState'], toState: HealthEvent['toState']): HealthEvent => ({ at, event, fromState, toState })

/** One occurrence of a rule, annunciated at each time given (re-activations after a return). */
function occurrence(
  ruleId: number,
  times: number[],
  opts: { priority?: Priority, alarmClass?: AlarmClass, closedAt?: number | null, events?: HealthEvent[] } = {}
): HealthAlarm {
  const events = opts.events ?? times.flatMap((t, i) => (i === 0 ? [activate(t)] : [ev(t - 1, 'return', 'unacknowledged', 'rtn_unacknowledged'), ev(t, 'activate', 'rtn_unacknowledged', 'unacknowledged')]))
  return {
    id: nextId++, ruleId, ruleName: `rule ${String(ruleId).padStart(2, '0')}`, priority: opts.priority ?? 'low',
    alarmClass: opts.alarmClass ?? 'alarm', raisedAt: times[0] ?? T0, closedAt: opts.closedAt === undefined ? (times.at(-1) ?? T0) + MIN : opts.closedAt, events,
  }
}
/** n separate occurrences of distinct rules, all annunciated at `at` + i seconds. */
const burst = (n: number, at: number, firstRule: number, alarmClass: AlarmClass = 'alarm') =>
  Array.from({ length: n }, (_, i) => occurrence(firstRule + i, [at + i * 1000], { alarmClass }))

describe('alarm rate and flood (ISA-18.2 §S7.4: > 10 annunciated alarms in 10 min is a flood; target ~1 per 10 min)', () => {
  it('one hour with 12 alarms in its first ten minutes and 1 in its second: 6 periods, average 13/6, peak 12, one flood period', () => {
    const alarms = [...burst(12, T0 + MIN, 100), ...burst(1, T0 + 12 * MIN, 200)]
    const r = alarmSystemHealth(alarms, HOUR_PERIOD)
    expect(r.tenMinutePeriods).toBe(6)
    expect(r.alarms.count).toBe(13)
    expect(r.alarms.averagePer10Min).toBeCloseTo(13 / 6, 12)
    expect(r.alarms.peakPer10Min).toBe(12)
    expect(r.alarms.floodPeriods).toBe(1)
    expect(r.alarms.floodShare).toBeCloseTo(1 / 6, 12)
    expect(r.alarms.perDay).toBeCloseTo(13 * 24, 9)
    expect(r.series.alarms).toEqual([12, 1, 0, 0, 0, 0])
    expect(r.series.time).toEqual([0, 1, 2, 3, 4, 5].map(i => T0 + i * TEN_MINUTES_MS))
  })

  it('exactly 10 in ten minutes is not a flood (the definition says more than 10)', () => {
    const r = alarmSystemHealth(burst(10, T0, 300), HOUR_PERIOD)
    expect(r.alarms.peakPer10Min).toBe(10)
    expect(r.alarms.floodPeriods).toBe(0)
  })

  it('advisory alerts are counted apart and never enter the alarm figures (ISA-18.2-2016 alerts)', () => {
    const r = alarmSystemHealth([...burst(3, T0, 400), ...burst(11, T0 + MIN, 500, 'alert')], HOUR_PERIOD)
    expect(r.alarms.count).toBe(3)
    expect(r.alarms.floodPeriods).toBe(0)
    expect(r.alerts.count).toBe(11)
    expect(r.alerts.peakPer10Min).toBe(11)
    expect(r.series.alerts[0]).toBe(11)
    expect(r.topTen.alarms.map(a => a.ruleId)).toEqual([400, 401, 402])
  })

  it('a re-activation of a returned, unacknowledged alarm is annunciated again and counts; an activation while shelved is not annunciated', () => {
    const reactivated = occurrence(600, [T0 + MIN, T0 + 3 * MIN, T0 + 5 * MIN])
    const shelved = occurrence(601, [T0 + MIN], { events: [activate(T0 + MIN), ev(T0 + 2 * MIN, 'shelve', 'unacknowledged', 'shelved'),
      ev(T0 + 3 * MIN, 'return', 'shelved', 'shelved'), ev(T0 + 4 * MIN, 'activate', 'shelved', 'shelved')] })
    const r = alarmSystemHealth([reactivated, shelved], HOUR_PERIOD)
    expect(r.alarms.count).toBe(3 + 1)
  })

  it('only annunciations inside the period count', () => {
    const r = alarmSystemHealth([occurrence(700, [T0 - MIN]), occurrence(701, [T0 + HOUR]), occurrence(702, [T0])], HOUR_PERIOD)
    expect(r.alarms.count).toBe(1)
  })
})

describe('chattering (≥ 3 activations of one alarm within 60 s, §S7.4) and the chatter index (Kondaveeti et al. 2013 [from memory])', () => {
  it('counts the most activations inside any 60 s span, the span closed at both ends', () => {
    expect(mostWithinSpan([0, 20_000, 40_000])).toBe(3)
    expect(mostWithinSpan([0, 30_000, 60_000])).toBe(3)
    expect(mostWithinSpan([0, 61_000, 122_000])).toBe(1)
    expect(mostWithinSpan([0, 10_000, 70_000, 75_000, 80_000])).toBe(3)
    expect(mostWithinSpan([])).toBe(0)
  })

  it('ψ is the mean of 1/run length in seconds: every 20 s gives 0.05, every second 1', () => {
    expect(chatterIndex([0, 20_000, 40_000])).toBeCloseTo(0.05, 12)
    expect(chatterIndex([0, 1000, 2000, 3000])).toBeCloseTo(1, 12)
    // Runs of 10 s and 40 s: (1/10 + 1/40) / 2.
    expect(chatterIndex([0, 10_000, 50_000])).toBeCloseTo((0.1 + 0.025) / 2, 12)
    expect(chatterIndex([0])).toBeNull()
  })

  it('lists the chattering alarms only, over re-activations of one occurrence', () => {
    const chatty = occurrence(800, [T0 + MIN, T0 + MIN + 20_000, T0 + MIN + 40_000])
    const calm = occurrence(801, [T0 + MIN, T0 + 3 * MIN, T0 + 5 * MIN])
    const r = alarmSystemHealth([chatty, calm], HOUR_PERIOD)
    expect(r.chattering).toEqual([{ ruleId: 800, ruleName: 'rule 800', count: 3, mostIn60s: 3, chatterIndex: expect.closeTo(0.05, 12) }])
  })
})

describe('stale alarms (standing for more than 24 h, §S7.4; target < 5 present on any day)', () => {
  const period: Period = { from: T0, to: T0 + 3 * DAY }
  it('counts occurrences standing more than 24 h and the most standing stale on one day', () => {
    const closedSameDay = occurrence(900, [T0], { closedAt: T0 + 23 * HOUR })
    const exactly24h = occurrence(901, [T0], { closedAt: T0 + DAY })
    const standing = occurrence(902, [T0], { closedAt: null })
    const fromBefore = occurrence(903, [T0 - 2 * DAY], { closedAt: T0 + HOUR })
    const standingFromNoon = occurrence(904, [T0 + 12 * HOUR], { closedAt: null })
    const s = staleAlarms([closedSameDay, exactly24h, standing, fromBefore, standingFromNoon], period)
    // Stale: 902 from day 1, 903 on day 0 until 01:00, 904 from day 1 12:00.
    expect(s.alarms.map(a => a.ruleName).sort()).toEqual(['rule 902', 'rule 903', 'rule 904'])
    expect(s.count).toBe(3)
    // Day 0: 903; day 1: 902 and 904; day 2: 902 and 904.
    expect(s.peakPerDay).toBe(2)
  })
})

describe('top ten most frequent alarms and their share of the load (ISA-TR18.2.5: ~< 1 %, 5 % at most)', () => {
  it('twelve rules raised 12, 11, …, 1 times: the top ten carry 75 of 78', () => {
    const alarms = Array.from({ length: 12 }, (_, i) =>
      occurrence(i + 1, Array.from({ length: 12 - i }, (_, k) => T0 + k * 2 * MIN + i * 1000)))
    const r = alarmSystemHealth(alarms, HOUR_PERIOD)
    expect(r.alarms.count).toBe(78)
    expect(r.topTen.alarms.map(a => a.count)).toEqual([12, 11, 10, 9, 8, 7, 6, 5, 4, 3])
    expect(r.topTen.alarms[0]).toMatchObject({ ruleId: 1, share: 12 / 78 })
    expect(r.topTen.share).toBeCloseTo(75 / 78, 12)
  })
})

describe('priority distribution against ~80 % low, 15 % medium, 5 % high (ISA-18.2, EEMUA 191)', () => {
  it('8 low, 1 medium, 1 high annunciations: 80 / 10 / 10 %, urgent 0, each beside its target', () => {
    const prios: Priority[] = ['low', 'low', 'low', 'low', 'low', 'low', 'low', 'low', 'medium', 'high']
    const r = alarmSystemHealth(prios.map((p, i) => occurrence(1000 + i, [T0 + i * MIN], { priority: p })), HOUR_PERIOD)
    expect(r.priorities).toEqual([
      { priority: 'urgent', count: 0, share: 0, target: 0.01 },
      { priority: 'high', count: 1, share: 0.1, target: 0.05 },
      { priority: 'medium', count: 1, share: 0.1, target: 0.15 },
      { priority: 'low', count: 8, share: 0.8, target: expect.closeTo(0.79, 12) },
    ])
  })

  it('the targets add up to the whole (the top level takes its 1 % from low)', () => {
    const r = alarmSystemHealth([], HOUR_PERIOD)
    expect(r.priorities.reduce((sum, p) => sum + p.target, 0)).toBeCloseTo(1, 12)
  })
})

describe('shelved and out-of-service counts and durations (ISA-18.2 states F and H)', () => {
  it('adds the time each alarm spent shelved inside the period, clipped at its ends', () => {
    const a = occurrence(1100, [T0], { events: [activate(T0), ev(T0 + 10 * MIN, 'shelve', 'unacknowledged', 'shelved'), ev(T0 + 40 * MIN, 'unshelve', 'shelved', 'unacknowledged')] })
    const stillShelved = occurrence(1101, [T0], { events: [activate(T0), ev(T0 + 50 * MIN, 'shelve', 'unacknowledged', 'shelved')], closedAt: null })
    const fromBefore = occurrence(1102, [T0 - HOUR], { events: [activate(T0 - HOUR), ev(T0 - 20 * MIN, 'shelve', 'unacknowledged', 'shelved'), ev(T0 + 10 * MIN, 'unshelve', 'shelved', 'normal')] })
    const s = setAside([a, stillShelved, fromBefore], 'shelved', HOUR_PERIOD)
    // Entered within the period: 1100 and 1101 (1102 was shelved before it started).
    expect(s.count).toBe(2)
    expect(s.totalMs).toBe((30 + 10 + 10) * MIN)
    expect(s.longestMs).toBe(30 * MIN)
    expect(s.standing).toBe(1)
  })

  it('out of service is counted from remove_from_service to return_to_service', () => {
    const a = occurrence(1200, [T0], { events: [ev(T0, 'remove_from_service', 'normal', 'out_of_service'), ev(T0 + MIN, 'activate', 'out_of_service', 'out_of_service'),
      ev(T0 + 25 * MIN, 'return_to_service', 'out_of_service', 'unacknowledged')] })
    const r = alarmSystemHealth([a], HOUR_PERIOD)
    expect(r.outOfService).toEqual({ count: 1, totalMs: 25 * MIN, longestMs: 25 * MIN, standing: 0 })
    expect(r.shelved.count).toBe(0)
    // The activation while out of service was not annunciated.
    expect(r.alarms.count).toBe(0)
  })

  it('refuses a period that ends before it starts', () => {
    expect(() => alarmSystemHealth([], { from: T0, to: T0 })).toThrow(RangeError)
  })
})
