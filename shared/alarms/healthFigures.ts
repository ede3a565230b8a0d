// Each alarm-system health figure beside its target and the standard it comes from, so the page,
// the printout and any export state the same targets. Target values as ISA-18.2 / IEC 62682 and
// EEMUA 191 publish them (the performance-metric tables; numbers recalled, docs/science.md §S7.4).
import type { HealthReport } from './health'
import { FLOOD_PER_10_MIN } from './health'

export type FigureFormat = 'count' | 'rate' | 'share' | 'duration'
/** meets: within the target; near: within the looser "manageable" limit; misses: beyond both. */
export type Assessment = 'meets' | 'near' | 'misses'

export interface HealthFigure {
  key: string
  label: string
  value: number
  format: FigureFormat
  target: string
  source: string
  /** null: the standard sets no pass/fail line for it (it is read, not scored). */
  assessment: Assessment | null
}

const ALARM_STANDARDS = 'ISA-18.2 / IEC 62682'
const ALL_STANDARDS = 'EEMUA 191; ISA-18.2 / IEC 62682'
/** Brinkline ends any shelve after 12 h (shared/schemas/alarm.ts MAX_SHELVE_MINUTES). */
const SHELVE_LIMIT_MS = 12 * 3_600_000

/** Lower is better: meets at or below `good`, near at or below `fair`. */
function grade(value: number, good: number, fair = good): Assessment {
  return value <= good ? 'meets' : value <= fair ? 'near' : 'misses'
}

export function healthFigures(r: HealthReport): HealthFigure[] {
  return [
    { key: 'averagePer10Min', label: 'Alarms per 10 minutes, average', value: r.alarms.averagePer10Min, format: 'rate',
      target: '≈ 1 very likely acceptable, ≈ 2 manageable', source: ALL_STANDARDS, assessment: grade(r.alarms.averagePer10Min, 1, 2) },
    { key: 'perDay', label: 'Alarms per day, average', value: r.alarms.perDay, format: 'rate',
      target: '≈ 150 very likely acceptable, ≈ 300 at most', source: ALL_STANDARDS, assessment: grade(r.alarms.perDay, 150, 300) },
    { key: 'peakPer10Min', label: 'Alarms in the busiest 10 minutes', value: r.alarms.peakPer10Min, format: 'count',
      target: `≤ ${FLOOD_PER_10_MIN} (more is a flood)`, source: ALARM_STANDARDS, assessment: grade(r.alarms.peakPer10Min, FLOOD_PER_10_MIN) },
    { key: 'floodShare', label: `Share of 10-minute periods in flood (> ${FLOOD_PER_10_MIN})`, value: r.alarms.floodShare, format: 'share',
      target: '< 1 %', source: ALARM_STANDARDS, assessment: r.alarms.floodShare < 0.01 ? 'meets' : 'misses' },
    { key: 'staleCount', label: 'Stale alarms (standing > 24 h), most on one day', value: r.stale.peakPerDay, format: 'count',
      target: '< 5 on any day', source: ALARM_STANDARDS, assessment: r.stale.peakPerDay < 5 ? 'meets' : 'misses' },
    { key: 'chattering', label: 'Chattering alarms (≥ 3 in 60 s)', value: r.chattering.length, format: 'count',
      target: 'none', source: ALARM_STANDARDS, assessment: grade(r.chattering.length, 0) },
    { key: 'topTenShare', label: 'Ten most frequent alarms, share of all alarms', value: r.topTen.share, format: 'share',
      target: '≈ 1 %, 5 % at most', source: ALARM_STANDARDS, assessment: grade(r.topTen.share, 0.01, 0.05) },
    { key: 'shelvedLongest', label: 'Longest shelve', value: r.shelved.longestMs / 1000, format: 'duration',
      target: 'time-limited (Brinkline ends a shelve at 12 h)', source: ALARM_STANDARDS, assessment: grade(r.shelved.longestMs, SHELVE_LIMIT_MS) },
    { key: 'outOfServiceStanding', label: 'Alarms out of service at the end of the period', value: r.outOfService.standing, format: 'count',
      target: 'each under a documented removal, reviewed', source: ALARM_STANDARDS, assessment: null },
    { key: 'alertsPer10Min', label: 'Advisory alerts per 10 minutes, average', value: r.alerts.averagePer10Min, format: 'rate',
      target: 'counted apart: alerts are not alarms and do not load the alarm rate', source: 'ISA-18.2 (2016, alerts)', assessment: null },
  ]
}
