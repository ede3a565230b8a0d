// Alarm-system health over a period, computed from alarm occurrences and their event trails, with
// the figures and targets of ISA-18.2 (and its TR18.2.5 monitoring report), IEC 62682 and EEMUA 191
// as docs/science.md §S7.4 gives them. One site counts as one operator position. Alarms
// and advisory alerts are counted apart (ISA-18.2-2016 alerts), so early warnings never enter the
// alarm-rate figures. Pure: the server loads the events, this counts them.
import type { AlarmClass, AlarmState, Priority } from './vocabulary'
import { PRIORITIES } from './vocabulary'

export const TEN_MINUTES_MS = 10 * 60_000
const DAY_MS = 86_400_000

/** ISA-18.2 / EEMUA 191: more than 10 annunciated alarms in 10 minutes is a flood. */
export const FLOOD_PER_10_MIN = 10
/** ISA-18.2: an alarm standing for more than 24 h is stale. */
export const STALE_AFTER_MS = DAY_MS
/** ISA-18.2 (secondary source): 3 or more activations of one alarm within 60 s is chattering. */
export const CHATTER_COUNT = 3
export const CHATTER_SPAN_MS = 60_000
/**
 * Chatter index above which an alarm counts as chattering, in activations per second
 * (Kondaveeti et al. 2013, run-length distributions) [from memory].
 */
export const CHATTER_INDEX_LIMIT = 0.05
/**
 * The usual target share of annunciated alarms per priority (ISA-18.2, EEMUA 191: about 5 % high,
 * 15 % medium, 80 % low, the top level reserved and rare [from memory]). The top level gets 1 %
 * and low the rest, so the targets add up to the whole.
 */
const URGENT_TARGET = 0.01
const HIGH_TARGET = 0.05
const MEDIUM_TARGET = 0.15
export const PRIORITY_TARGETS: Record<Priority, number> = {
  urgent: URGENT_TARGET, high: HIGH_TARGET, medium: MEDIUM_TARGET, low: 1 - URGENT_TARGET - HIGH_TARGET - MEDIUM_TARGET,
}

export interface HealthEvent {
  /** Process time of the transition where known, else when it was recorded (ms). */
  at: number
  event: string
  fromState: AlarmState | null
  toState: AlarmState
}

export interface HealthAlarm {
  id: number
  ruleId: number
  ruleName: string
  priority: Priority
  alarmClass: AlarmClass
  raisedAt: number
  /** When the occurrence went back to normal; null while it stands. */
  closedAt: number | null
  /** Its events, oldest first. */
  events: HealthEvent[]
}

export interface Period { from: number, to: number }

/** An annunciation: an activation the operator is shown (not one that happened while set aside). */
export const isAnnunciation = (e: HealthEvent): boolean => e.event === 'activate' && e.toState === 'unacknowledged'

const inPeriod = (t: number, p: Period) => t >= p.from && t < p.to
/** Ten-minute periods in the period; a shorter last one counts as a whole period. */
export const tenMinutePeriods = (p: Period): number => Math.max(1, Math.ceil((p.to - p.from) / TEN_MINUTES_MS))

/** Annunciation times of one class in the period, each with its alarm. */
function annunciations(alarms: HealthAlarm[], alarmClass: AlarmClass, p: Period) {
  return alarms.filter(a => a.alarmClass === alarmClass)
    .flatMap(a => a.events.filter(e => isAnnunciation(e) && inPeriod(e.at, p)).map(e => ({ alarm: a, at: e.at })))
}

/** Counts per ten-minute period, the first starting at `from`. */
export function countsPer10Min(times: number[], p: Period): number[] {
  const counts = new Array<number>(tenMinutePeriods(p)).fill(0)
  for (const t of times) if (inPeriod(t, p)) counts[Math.floor((t - p.from) / TEN_MINUTES_MS)]! += 1
  return counts
}

export interface RateFigures {
  count: number
  perDay: number
  averagePer10Min: number
  peakPer10Min: number
  /** Share of ten-minute periods with more than FLOOD_PER_10_MIN (ISA-18.2 target ~< 1 %). */
  floodShare: number
  floodPeriods: number
}

function rates(times: number[], p: Period): RateFigures {
  const counts = countsPer10Min(times, p)
  const floodPeriods = counts.filter(c => c > FLOOD_PER_10_MIN).length
  return {
    count: times.length,
    perDay: times.length / ((p.to - p.from) / DAY_MS),
    averagePer10Min: times.length / counts.length,
    peakPer10Min: Math.max(0, ...counts),
    floodShare: floodPeriods / counts.length,
    floodPeriods,
  }
}

/** Most activations of one alarm within any CHATTER_SPAN_MS (inclusive), from sorted times. */
export function mostWithinSpan(sorted: number[], spanMs = CHATTER_SPAN_MS): number {
  let best = sorted.length > 0 ? 1 : 0
  for (let i = 0, j = 0; j < sorted.length; j++) {
    while (sorted[j]! - sorted[i]! > spanMs) i++
    best = Math.max(best, j - i + 1)
  }
  return best
}

/**
 * Chatter index ψ = Σ_r P(r) / r over the run lengths r between consecutive activations, in whole
 * seconds (at least 1): an alarm that activates every second scores 1, every 20 s 0.05
 * (Kondaveeti et al. 2013) [from memory]. null with fewer than two activations.
 */
export function chatterIndex(sorted: number[]): number | null {
  if (sorted.length < 2) return null
  let sum = 0
  for (let i = 1; i < sorted.length; i++) sum += 1 / Math.max(1, Math.round((sorted[i]! - sorted[i - 1]!) / 1000))
  return sum / (sorted.length - 1)
}

export interface AlarmCount { ruleId: number, ruleName: string, count: number, share: number }
export interface ChatteringAlarm { ruleId: number, ruleName: string, count: number, mostIn60s: number, chatterIndex: number | null }

function perRule(items: { alarm: HealthAlarm, at: number }[]) {
  const byRule = new Map<number, { ruleName: string, times: number[] }>()
  for (const { alarm, at } of items) {
    const entry = byRule.get(alarm.ruleId) ?? { ruleName: alarm.ruleName, times: [] }
    entry.times.push(at)
    byRule.set(alarm.ruleId, entry)
  }
  return [...byRule.entries()].map(([ruleId, e]) => ({ ruleId, ruleName: e.ruleName, times: e.times.sort((a, b) => a - b) }))
}

/** The ten most frequent alarms (ties by name) and their combined share of the load (TR18.2.5: ~< 1 %, 5 % at most). */
export function topTen(items: { alarm: HealthAlarm, at: number }[]): { alarms: AlarmCount[], share: number } {
  const total = items.length
  const alarms = perRule(items)
    .map(r => ({ ruleId: r.ruleId, ruleName: r.ruleName, count: r.times.length, share: total ? r.times.length / total : 0 }))
    .sort((a, b) => b.count - a.count || a.ruleName.localeCompare(b.ruleName)).slice(0, 10)
  return { alarms, share: alarms.reduce((s, a) => s + a.share, 0) }
}

export interface StaleFigures {
  /** Occurrences that stood for more than 24 h at some time in the period. */
  count: number
  /** Most stale alarms standing on any one day of the period (ISA-18.2 target: < 5). */
  peakPerDay: number
  alarms: { alarmId: number, ruleName: string, raisedAt: number, closedAt: number | null }[]
}

export function staleAlarms(alarms: HealthAlarm[], p: Period): StaleFigures {
  // Stale from raise + 24 h until the occurrence closes (or the period ends).
  const stale = alarms.map(a => ({ a, from: a.raisedAt + STALE_AFTER_MS, to: Math.min(a.closedAt ?? p.to, p.to) }))
    .filter(s => s.from < s.to && s.to > p.from)
  const days = Math.max(1, Math.ceil((p.to - p.from) / DAY_MS))
  let peakPerDay = 0
  for (let d = 0; d < days; d++) {
    const dayFrom = p.from + d * DAY_MS
    const dayTo = Math.min(p.to, dayFrom + DAY_MS)
    peakPerDay = Math.max(peakPerDay, stale.filter(s => s.from < dayTo && s.to > dayFrom).length)
  }
  return {
    count: stale.length,
    peakPerDay,
    alarms: stale.map(({ a }) => ({ alarmId: a.id, ruleName: a.ruleName, raisedAt: a.raisedAt, closedAt: a.closedAt })),
  }
}

export interface SetAsideFigures {
  /** Times an alarm entered the state within the period. */
  count: number
  /** Time spent in the state within the period, summed over alarms (ms). */
  totalMs: number
  longestMs: number
  /** Alarms still in the state at the period's end. */
  standing: number
}

/** Intervals an alarm spent in `state`, from its events, clipped to the period. */
export function setAside(alarms: HealthAlarm[], state: 'shelved' | 'out_of_service' | 'suppressed', p: Period): SetAsideFigures {
  let count = 0
  let totalMs = 0
  let longestMs = 0
  let standing = 0
  for (const a of alarms) {
    let since: number | null = null
    const close = (end: number) => {
      const ms = Math.max(0, Math.min(end, p.to) - Math.max(since!, p.from))
      totalMs += ms
      longestMs = Math.max(longestMs, ms)
      since = null
    }
    for (const e of a.events) {
      if (e.toState === state && e.fromState !== state) {
        since = e.at
        if (inPeriod(e.at, p)) count++
      }
      else if (since !== null && e.fromState === state && e.toState !== state) close(e.at)
    }
    if (since !== null && since < p.to) {
      standing++
      close(p.to)
    }
  }
  return { count, totalMs, longestMs, standing }
}

export interface PriorityShare { priority: Priority, count: number, share: number, target: number }

export function priorityDistribution(items: { alarm: HealthAlarm }[]): PriorityShare[] {
  return PRIORITIES.map((priority) => {
    const count = items.filter(i => i.alarm.priority === priority).length
    return { priority, count, share: items.length ? count / items.length : 0, target: PRIORITY_TARGETS[priority] }
  })
}

export interface HealthReport {
  period: Period
  tenMinutePeriods: number
  alarms: RateFigures
  /** Advisory alerts, counted apart from alarms. */
  alerts: RateFigures
  stale: StaleFigures
  chattering: ChatteringAlarm[]
  topTen: { alarms: AlarmCount[], share: number }
  priorities: PriorityShare[]
  shelved: SetAsideFigures
  outOfService: SetAsideFigures
  suppressed: SetAsideFigures
  /** Start of each ten-minute period (ms) and the alarms and alerts annunciated in it, for the chart. */
  series: { time: number[], alarms: number[], alerts: number[] }
}

export function alarmSystemHealth(all: HealthAlarm[], p: Period): HealthReport {
  if (!(p.to > p.from)) throw new RangeError('the period must end after it starts')
  const alarmItems = annunciations(all, 'alarm', p)
  const alertItems = annunciations(all, 'alert', p)
  const alarmsOnly = all.filter(a => a.alarmClass === 'alarm')
  const chattering = perRule(alarmItems)
    .map(r => ({
      ruleId: r.ruleId, ruleName: r.ruleName, count: r.times.length,
      mostIn60s: mostWithinSpan(r.times), chatterIndex: chatterIndex(r.times),
    }))
    .filter(r => r.mostIn60s >= CHATTER_COUNT)
    .sort((a, b) => b.mostIn60s - a.mostIn60s || a.ruleName.localeCompare(b.ruleName))
  const alarmCounts = countsPer10Min(alarmItems.map(i => i.at), p)
  return {
    period: p,
    tenMinutePeriods: alarmCounts.length,
    alarms: rates(alarmItems.map(i => i.at), p),
    alerts: rates(alertItems.map(i => i.at), p),
    stale: staleAlarms(alarmsOnly, p),
    chattering,
    topTen: topTen(alarmItems),
    priorities: priorityDistribution(alarmItems),
    shelved: setAside(alarmsOnly, 'shelved', p),
    outOfService: setAside(alarmsOnly, 'out_of_service', p),
    suppressed: setAside(alarmsOnly, 'suppressed', p),
    series: {
      time: alarmCounts.map((_, i) => p.from + i * TEN_MINUTES_MS),
      alarms: alarmCounts,
      alerts: countsPer10Min(alertItems.map(i => i.at), p),
    },
  }
}
