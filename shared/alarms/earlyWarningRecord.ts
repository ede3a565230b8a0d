// The early-warning record, per unit: of the incidents that reached a limit alarm, how many had a
// slowing-down alert before it and how long before (the median lead); and the early-warning alerts
// no limit alarm followed, with the supervisor's verdict on each (false, or averted by the
// operators). Built on incidents (shared/alarms/incidents.ts), which decide what belongs together.
import type { AlertOutcome } from './reviewVocabulary'
import { earlyWarningSummary, isEarlyWarning, isLimitAlarm, type IncidentMember } from './incidents'

export interface RecordIncident {
  incidentId: number
  unitId: number
  members: (Pick<IncidentMember, 'alarmId' | 'raisedAt' | 'measure' | 'alarmClass'> & { outcome: AlertOutcome | null })[]
}

export interface UnitEarlyWarningRecord {
  unitId: number
  /** Incidents with a limit alarm. */
  limitAlarmIncidents: number
  /** Of those, the ones whose first slowing-down alert came before the first limit alarm. */
  warnedBefore: number
  /** Median lead of the warned ones, seconds; null when none. */
  medianLeadS: number | null
  /** Early-warning alerts in incidents that never reached a limit alarm after them. */
  unfollowedAlerts: { alarmId: number, incidentId: number, raisedAt: number, outcome: AlertOutcome | null }[]
  unfollowedByOutcome: { false: number, averted: number, unmarked: number }
}

export function median(values: number[]): number | null {
  if (values.length === 0) return null
  const s = [...values].sort((a, b) => a - b)
  const mid = Math.floor(s.length / 2)
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2
}

type Timed = Pick<IncidentMember, 'measure' | 'alarmClass'> & { raisedAt: number | string | Date }
const at = (m: Timed) => new Date(m.raisedAt).getTime()

/**
 * The incident's slowing-down alerts that no limit alarm followed: the only ones a supervisor may
 * mark false or averted. An alert a limit alarm came after is the early warning that worked (its
 * lead time is the record's measure), whatever the operators did in between.
 */
export function unfollowedAlertsOf<M extends Timed>(members: readonly M[]): M[] {
  const lastLimit = Math.max(Number.NEGATIVE_INFINITY, ...members.filter(isLimitAlarm).map(at))
  return members.filter(m => isEarlyWarning(m) && at(m) >= lastLimit)
}

export function earlyWarningRecord(incidents: RecordIncident[]): UnitEarlyWarningRecord[] {
  const units = [...new Set(incidents.map(i => i.unitId))].sort((a, b) => a - b)
  return units.map((unitId) => {
    const mine = incidents.filter(i => i.unitId === unitId)
    const leads: number[] = []
    let limitAlarmIncidents = 0
    const unfollowedAlerts: UnitEarlyWarningRecord['unfollowedAlerts'] = []
    for (const incident of mine) {
      const summary = earlyWarningSummary(incident.members)
      if (summary.limitAlarmAt !== null) limitAlarmIncidents++
      if (summary.verdict === 'before') leads.push(summary.leadTimeS!)
      for (const m of unfollowedAlertsOf(incident.members)) {
        unfollowedAlerts.push({ alarmId: m.alarmId, incidentId: incident.incidentId, raisedAt: m.raisedAt, outcome: m.outcome })
      }
    }
    const count = (o: AlertOutcome | null) => unfollowedAlerts.filter(a => a.outcome === o).length
    return {
      unitId,
      limitAlarmIncidents,
      warnedBefore: leads.length,
      medianLeadS: median(leads),
      unfollowedAlerts,
      unfollowedByOutcome: { false: count('false'), averted: count('averted'), unmarked: count(null) },
    }
  })
}
