// What a replay of stored history says about a tag's rules (issue 14 item 4): what would have
// fired and when, how long before a known event (trip, runaway, collapse) each rule first
// warned, and how often it fired on the rest of the record, per day of it. Pure arithmetic over
// the activation times the replay found; the job (server/services/replay) stores the result.
import type { ConditionSettings } from '../alarms/conditionTracker'
import type { AlarmClass, Priority, TagMeasure } from '../alarms/vocabulary'

const DAY_S = 86_400

/** A rule as the replay ran it, copied from the tag's rules when the replay was asked for. */
export interface ReplayRule extends ConditionSettings {
  id: number
  name: string
  measure: TagMeasure
  alarmClass: AlarmClass
  priority: Priority
}

/** An activation or return a rule would have had, at a process time (s). */
export interface ReplayFiring {
  ruleId: number
  time: number
  value: number | null
  change: 'activate' | 'return'
}

export interface ReplaySpan {
  /** The replayed range (s). */
  from: number
  to: number
  /** The marked event (s), or null. */
  eventTime: number | null
  /** An activation this long before the event, or less, is a warning of it. */
  warningWindowS: number
}

export interface RuleOutcome {
  ruleId: number
  name: string
  alarmClass: AlarmClass
  activations: number
  /** Seconds from the rule's first activation in the warning window to the event; null without one. */
  leadTimeS: number | null
  /** Activations in normal operation: before the warning window, or anywhere without an event. */
  falseAlarms: number
  falseAlarmsPerDay: number | null
}

export interface ReplayOutcome {
  rules: RuleOutcome[]
  /** The earliest warning of any rule; null when none warned (or no event was marked). */
  leadTimeS: number | null
  falseAlarms: number
  falseAlarmsPerDay: number | null
  /** Days of normal operation the false alarms are counted over. */
  normalDays: number
}

/**
 * Where an activation falls. After the event the plant is in its upset and what fires then
 * neither warned nor was false, so it is counted in neither.
 */
export function activationKind(span: ReplaySpan, time: number): 'warning' | 'false' | 'after event' {
  if (span.eventTime === null) return 'false'
  if (time > span.eventTime) return 'after event'
  return time >= span.eventTime - span.warningWindowS ? 'warning' : 'false'
}

/** Seconds of the range that count as normal operation. */
export function normalSeconds(span: ReplaySpan): number {
  const end = span.eventTime === null ? span.to : Math.min(span.to, span.eventTime - span.warningWindowS)
  return Math.max(0, end - span.from)
}

export function replayOutcome(rules: readonly ReplayRule[], firings: readonly ReplayFiring[], span: ReplaySpan): ReplayOutcome {
  const days = normalSeconds(span) / DAY_S
  const perDay = (n: number) => (days > 0 ? n / days : null)
  const outcomes = rules.map((rule): RuleOutcome => {
    const times = firings.filter(f => f.ruleId === rule.id && f.change === 'activate').map(f => f.time)
    const warnings = times.filter(t => activationKind(span, t) === 'warning')
    const falseAlarms = times.filter(t => activationKind(span, t) === 'false').length
    return {
      ruleId: rule.id,
      name: rule.name,
      alarmClass: rule.alarmClass,
      activations: times.length,
      leadTimeS: warnings.length > 0 ? span.eventTime! - Math.min(...warnings) : null,
      falseAlarms,
      falseAlarmsPerDay: perDay(falseAlarms),
    }
  })
  const leads = outcomes.flatMap(o => (o.leadTimeS === null ? [] : [o.leadTimeS]))
  const falseAlarms = outcomes.reduce((sum, o) => sum + o.falseAlarms, 0)
  return {
    rules: outcomes,
    leadTimeS: leads.length > 0 ? Math.max(...leads) : null,
    falseAlarms,
    falseAlarmsPerDay: perDay(falseAlarms),
    normalDays: days,
  }
}

/** The chart of a replay: the tag's values per display bucket and the judgement at each evaluation. */
export interface ReplayChart {
  time: number[]
  value: (number | null)[]
  pointTime: number[]
  ar1: (number | null)[]
  pAr1: (number | null)[]
}

export interface ReplayResult extends ReplayOutcome {
  samples: number
  evaluations: number
  firings: ReplayFiring[]
  chart: ReplayChart
}
