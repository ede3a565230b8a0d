// Incidents: alarms and alerts on one unit that belong together. Two occurrences belong together
// when the later one is raised while the earlier still stands, or within the site's incident
// window after it ended — the gap-tolerant merge of their standing intervals. The incident keeps
// the product's own measure: did the slowing-down alert come before the limit alarm, and by how
// much (the lead time). Pure: the server stores what this decides.
import type { AlarmClass, TagMeasure } from './vocabulary'

export interface IncidentMember {
  alarmId: number
  unitId: number
  raisedAt: number
  /** When the occurrence stopped standing (condition cleared or closed); null while it stands. */
  endedAt: number | null
  measure: TagMeasure
  alarmClass: AlarmClass
}

/** The latest time the member stands to (Infinity while it stands). */
const reachOf = (m: Pick<IncidentMember, 'raisedAt' | 'endedAt'>) => m.endedAt ?? Number.POSITIVE_INFINITY

/** Until when an incident still takes new alarms: its members' latest end plus the window. */
export function incidentOpenUntil(members: Pick<IncidentMember, 'raisedAt' | 'endedAt'>[], windowMs: number): number {
  return Math.max(Number.NEGATIVE_INFINITY, ...members.map(m => Math.max(m.raisedAt, reachOf(m)))) + windowMs
}

/** Whether an alarm raised at `raisedAt` joins an incident with these members. */
export const joinsIncident = (members: Pick<IncidentMember, 'raisedAt' | 'endedAt'>[], raisedAt: number, windowMs: number): boolean =>
  members.length > 0 && raisedAt <= incidentOpenUntil(members, windowMs) && raisedAt >= Math.min(...members.map(m => m.raisedAt)) - windowMs

/** Groups occurrences into incidents per unit, in order of raising; each group's alarm ids, oldest first. */
export function groupIntoIncidents(members: IncidentMember[], windowMs: number): number[][] {
  const sorted = [...members].sort((a, b) => a.raisedAt - b.raisedAt || a.alarmId - b.alarmId)
  const open = new Map<number, { ids: number[], until: number }>()
  const groups: number[][] = []
  for (const m of sorted) {
    const current = open.get(m.unitId)
    if (current && m.raisedAt <= current.until) {
      current.ids.push(m.alarmId)
      current.until = Math.max(current.until, reachOf(m) + windowMs)
    }
    else {
      const group = { ids: [m.alarmId], until: reachOf(m) + windowMs }
      groups.push(group.ids)
      open.set(m.unitId, group)
    }
  }
  return groups
}

/** A slowing-down alert is the engine's early warning; a limit alarm watches the raw value. */
export const isEarlyWarning = (m: Pick<IncidentMember, 'measure'>) => m.measure === 'early_warning'
export const isLimitAlarm = (m: Pick<IncidentMember, 'measure' | 'alarmClass'>) => m.measure === 'value' && m.alarmClass === 'alarm'

export interface EarlyWarningSummary {
  earlyWarningAt: number | null
  limitAlarmAt: number | null
  /** Seconds from the first early warning to the first limit alarm; negative when the alert came later. */
  leadTimeS: number | null
  /** 'before': warned ahead of the limit alarm; 'after': the alarm came first; 'no_warning'; 'no_limit_alarm'; 'neither'. */
  verdict: 'before' | 'after' | 'no_warning' | 'no_limit_alarm' | 'neither'
}

export function earlyWarningSummary(members: Pick<IncidentMember, 'raisedAt' | 'measure' | 'alarmClass'>[]): EarlyWarningSummary {
  const first = (list: typeof members) => (list.length ? Math.min(...list.map(m => m.raisedAt)) : null)
  const earlyWarningAt = first(members.filter(isEarlyWarning))
  const limitAlarmAt = first(members.filter(isLimitAlarm))
  if (earlyWarningAt === null || limitAlarmAt === null) {
    const verdict = earlyWarningAt === null ? (limitAlarmAt === null ? 'neither' : 'no_warning') : 'no_limit_alarm'
    return { earlyWarningAt, limitAlarmAt, leadTimeS: null, verdict }
  }
  const leadTimeS = (limitAlarmAt - earlyWarningAt) / 1000
  return { earlyWarningAt, limitAlarmAt, leadTimeS, verdict: leadTimeS > 0 ? 'before' : 'after' }
}

/** Splits `ids` out of an incident's members; refuses a split that would leave either side empty. */
export function splitMembers(memberIds: number[], ids: number[]): { keep: number[], move: number[] } | string {
  const unknown = ids.filter(id => !memberIds.includes(id))
  if (unknown.length) return `alarm ${unknown.join(', ')} is not in this incident`
  const move = memberIds.filter(id => ids.includes(id))
  const keep = memberIds.filter(id => !ids.includes(id))
  if (move.length === 0) return 'name at least one alarm to split off'
  if (keep.length === 0) return 'a split must leave at least one alarm in the incident'
  return { keep, move }
}
