import { describe, expect, it } from 'vitest'
import { activationKind, normalSeconds, replayOutcome, type ReplayFiring, type ReplayRule } from '../../../../shared/pipeline/replayOutcome'

// The counts follow the definitions beside replayOutcome (lead time: event time minus the first
// warning, [common practice] in early-warning evaluation; false alarms per day of normal
// operation, the rate ISA-18.2 alarm-system performance is stated in [common practice]); the
// expected numbers are worked by hand from those definitions below each case.
const rule = (id: number, name: string): ReplayRule => ({
  id, name, measure: 'early_warning', alarmClass: 'alert', priority: 'low',
  comparison: 'above', threshold: 0.5, deadband: 0, onDelayS: 0, offDelayS: 0,
})
const at = (ruleId: number, time: number, change: ReplayFiring['change'] = 'activate'): ReplayFiring => ({ ruleId, time, value: 1, change })
const DAY = 86_400

describe('replayOutcome', () => {
  const span = { from: 0, to: 4 * DAY, eventTime: 3 * DAY, warningWindowS: 3_600 }

  it('sorts activations into warnings, false alarms and the upset after the event', () => {
    expect(activationKind(span, 3 * DAY - 3_600)).toBe('warning') // the window's edge counts as a warning
    expect(activationKind(span, 3 * DAY - 3_601)).toBe('false')
    expect(activationKind(span, 3 * DAY)).toBe('warning')
    expect(activationKind(span, 3 * DAY + 1)).toBe('after event')
    expect(activationKind({ ...span, eventTime: null }, 3 * DAY + 1)).toBe('false')
  })

  it('counts normal operation up to the warning window, or over the whole range without an event', () => {
    expect(normalSeconds(span)).toBe(3 * DAY - 3_600)
    expect(normalSeconds({ ...span, eventTime: null })).toBe(4 * DAY)
    // An event within one warning window of the start leaves no normal operation at all.
    expect(normalSeconds({ ...span, eventTime: 1_000 })).toBe(0)
  })

  it('gives each rule its lead time and false alarms per day, and the earliest warning overall', () => {
    const firings = [
      at(1, 0.5 * DAY), at(1, 0.6 * DAY, 'return'), at(1, 2 * DAY), // two false alarms
      at(1, 3 * DAY - 1_800), at(1, 3 * DAY - 600), // warned 1,800 s before
      at(2, 3 * DAY - 300), at(2, 3 * DAY + 60), // warned 300 s before; the second is in the upset
    ]
    const out = replayOutcome([rule(1, 'slowing down'), rule(2, 'limit')], firings, span)
    // Normal operation: 3 days less one hour = 71/24 days; 2 false alarms / (71/24) = 48/71 per day.
    expect(out.normalDays).toBeCloseTo(71 / 24, 12)
    expect(out.rules[0]).toMatchObject({ activations: 4, leadTimeS: 1_800, falseAlarms: 2 })
    expect(out.rules[0]!.falseAlarmsPerDay).toBeCloseTo(48 / 71, 12)
    expect(out.rules[1]).toMatchObject({ activations: 2, leadTimeS: 300, falseAlarms: 0, falseAlarmsPerDay: 0 })
    expect(out.leadTimeS).toBe(1_800)
    expect(out.falseAlarms).toBe(2)
  })

  it('reports no lead time without an event and no rate without normal operation', () => {
    const noEvent = replayOutcome([rule(1, 'a')], [at(1, DAY)], { ...span, eventTime: null })
    expect(noEvent.leadTimeS).toBeNull()
    expect(noEvent.falseAlarmsPerDay).toBeCloseTo(1 / 4, 12)
    const early = replayOutcome([rule(1, 'a')], [at(1, 500)], { ...span, eventTime: 1_000 })
    expect(early.rules[0]).toMatchObject({ leadTimeS: 500, falseAlarms: 0, falseAlarmsPerDay: null })
  })
})
