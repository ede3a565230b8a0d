import { describe, expect, it } from 'vitest'
import { earlyWarningSummary, groupIntoIncidents, incidentOpenUntil, joinsIncident, splitMembers, type IncidentMember } from '../../../../shared/alarms/incidents'
import { earlyWarningRecord, median } from '../../../../shared/alarms/earlyWarningRecord'

// Grouping rule (docs/design.md, incidents): an alarm joins the incident on its unit while one of
// the incident's alarms stands or within the window after the last one ended. Expected groups are
// worked out by hand from that rule.
const MIN = 60_000
const m = (alarmId: number, unitId: number, raisedMin: number, endedMin: number | null, measure: IncidentMember['measure'] = 'value', alarmClass: IncidentMember['alarmClass'] = 'alarm'): IncidentMember =>
  ({ alarmId, unitId, raisedAt: raisedMin * MIN, endedAt: endedMin === null ? null : endedMin * MIN, measure, alarmClass })

describe('automatic grouping of alarms into incidents', () => {
  const members = [m(1, 1, 0, 5), m(2, 1, 20, 25), m(3, 1, 70, 80), m(4, 2, 21, 22), m(5, 1, 100, null), m(6, 1, 500, 501)]
  it('with a 30 min window: 20 min after an alarm that ended at 5 joins; 70 after one ended at 25 does not; other units apart; a standing alarm keeps its incident open', () => {
    expect(groupIntoIncidents(members, 30 * MIN)).toEqual([[1, 2], [4], [3, 5, 6]])
  })
  it('the window is a setting: at 10 min the first two are apart too', () => {
    expect(groupIntoIncidents(members, 10 * MIN)).toEqual([[1], [2], [4], [3], [5, 6]])
  })
  it('joinsIncident agrees with the grouping for one new alarm', () => {
    const incident = [m(1, 1, 0, 5), m(2, 1, 20, 25)]
    expect(incidentOpenUntil(incident, 30 * MIN)).toBe(55 * MIN)
    expect(joinsIncident(incident, 55 * MIN, 30 * MIN)).toBe(true)
    expect(joinsIncident(incident, 56 * MIN, 30 * MIN)).toBe(false)
    expect(joinsIncident([m(1, 1, 0, null)], 5000 * MIN, 30 * MIN)).toBe(true)
    expect(joinsIncident([], 0, 30 * MIN)).toBe(false)
  })
})

describe('lead time: the first slowing-down alert before the first limit alarm', () => {
  it('an alert 10 min before the limit alarm: lead 600 s, warned before', () => {
    const s = earlyWarningSummary([m(1, 1, 0, null, 'early_warning', 'alert'), m(2, 1, 10, null), m(3, 1, 12, null, 'early_warning', 'alert')])
    expect(s).toEqual({ earlyWarningAt: 0, limitAlarmAt: 10 * MIN, leadTimeS: 600, verdict: 'before' })
  })
  it('an alert after the limit alarm has a negative lead; missing either side has none', () => {
    expect(earlyWarningSummary([m(1, 1, 5, null, 'early_warning', 'alert'), m(2, 1, 2, null)])).toMatchObject({ leadTimeS: -180, verdict: 'after' })
    expect(earlyWarningSummary([m(2, 1, 2, null)])).toMatchObject({ leadTimeS: null, verdict: 'no_warning' })
    expect(earlyWarningSummary([m(1, 1, 5, null, 'early_warning', 'alert')])).toMatchObject({ leadTimeS: null, verdict: 'no_limit_alarm' })
    // A fold-in-view alarm is predictive, not a limit alarm.
    expect(earlyWarningSummary([m(1, 1, 5, null, 'fold_horizon', 'alarm')]).verdict).toBe('neither')
  })
})

describe('splitting an incident', () => {
  it('moves the named alarms and keeps the rest; refuses an empty side or a stranger', () => {
    expect(splitMembers([1, 2, 3], [3, 1])).toEqual({ keep: [2], move: [1, 3] })
    expect(splitMembers([1, 2], [1, 2])).toMatch(/at least one alarm in the incident/)
    expect(splitMembers([1, 2], [])).toMatch(/at least one alarm/)
    expect(splitMembers([1, 2], [9])).toMatch(/alarm 9 is not in this incident/)
  })
})

describe('early-warning record per unit', () => {
  it('median of leads 600 s and 1200 s is 900 s; a limit alarm without warning counts in the total only; unfollowed alerts by verdict', () => {
    const alert = (alarmId: number, raisedMin: number, outcome: 'false' | 'averted' | null = null) => ({ ...m(alarmId, 1, raisedMin, null, 'early_warning', 'alert'), outcome })
    const limit = (alarmId: number, raisedMin: number) => ({ ...m(alarmId, 1, raisedMin, null), outcome: null })
    const record = earlyWarningRecord([
      { incidentId: 1, unitId: 1, members: [alert(1, 0), limit(2, 10)] },
      { incidentId: 2, unitId: 1, members: [alert(3, 100), limit(4, 120)] },
      { incidentId: 3, unitId: 1, members: [limit(5, 300)] },
      { incidentId: 4, unitId: 1, members: [alert(6, 400, 'averted')] },
      { incidentId: 5, unitId: 1, members: [alert(7, 500)] },
      { incidentId: 6, unitId: 2, members: [alert(8, 0, 'false')] },
    ])
    expect(record).toHaveLength(2)
    expect(record[0]).toMatchObject({
      unitId: 1, limitAlarmIncidents: 3, warnedBefore: 2, medianLeadS: 900, unfollowedByOutcome: { false: 0, averted: 1, unmarked: 1 }
    })
    expect(record[0]!.unfollowedAlerts.map(a => a.alarmId)).toEqual([6, 7])
    expect(record[1]).toMatchObject({
      unitId: 2, limitAlarmIncidents: 0, warnedBefore: 0, medianLeadS: null, unfollowedByOutcome: { false: 1, averted: 0, unmarked: 0 }
    })
  })
  it('median of an odd and an even count', () => {
    expect(median([3, 1, 2])).toBe(2)
    expect(median([4, 1, 2, 3])).toBe(2.5)
    expect(median([])).toBeNull()
  })
})
