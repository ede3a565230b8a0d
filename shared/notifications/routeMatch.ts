// Which notification routes want a given alarm, now. Pure, so each condition is unit-tested:
// site and (optionally) unit, minimum priority, alarm class (alarm or advisory alert), and the
// route's hours — always, or working hours in the site's own time zone.
import { priorityRank, type AlarmClass, type Priority } from '../alarms/vocabulary'

export const ROUTE_DELIVERIES = ['immediate', 'digest'] as const
export type RouteDelivery = typeof ROUTE_DELIVERIES[number]
export const ROUTE_HOURS = ['always', 'working'] as const
export type RouteHours = typeof ROUTE_HOURS[number]

export interface RouteFilter {
  siteId: number
  unitId: number | null
  minPriority: Priority
  alarmClasses: readonly AlarmClass[]
  hours: RouteHours
  /** Minutes after local midnight; an end before the start spans midnight (a night shift). */
  workStartMinute: number
  workEndMinute: number
  /** ISO weekdays, 1 = Monday … 7 = Sunday, of the local day the window starts on. */
  workDays: readonly number[]
  enabled: boolean
}

export interface AlarmFacts { siteId: number, unitId: number, priority: Priority, alarmClass: AlarmClass }

const WEEKDAY: Record<string, number> = { Mon: 1, Tue: 2, Wed: 3, Thu: 4, Fri: 5, Sat: 6, Sun: 7 }

/** Local ISO weekday and minute of the day of `now` in `timeZone`. */
export function localClock(now: Date, timeZone: string): { weekday: number, minute: number } {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'short', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(now)
  const get = (type: string) => parts.find(p => p.type === type)?.value ?? ''
  return { weekday: WEEKDAY[get('weekday')] ?? 1, minute: Number(get('hour')) * 60 + Number(get('minute')) }
}

export function withinWorkingHours(route: Pick<RouteFilter, 'workStartMinute' | 'workEndMinute' | 'workDays'>, now: Date, timeZone: string): boolean {
  const { weekday, minute } = localClock(now, timeZone)
  const { workStartMinute: start, workEndMinute: end } = route
  if (start < end) return route.workDays.includes(weekday) && minute >= start && minute < end
  // Spans midnight: the early-morning part belongs to the window that started the day before.
  const yesterday = weekday === 1 ? 7 : weekday - 1
  return (minute >= start && route.workDays.includes(weekday)) || (minute < end && route.workDays.includes(yesterday))
}

export function routeWants(route: RouteFilter, alarm: AlarmFacts, now: Date, timeZone: string): boolean {
  return route.enabled
    && route.siteId === alarm.siteId
    && (route.unitId === null || route.unitId === alarm.unitId)
    && priorityRank(alarm.priority) <= priorityRank(route.minPriority)
    && route.alarmClasses.includes(alarm.alarmClass)
    && (route.hours === 'always' || withinWorkingHours(route, now, timeZone))
}

/** "07:00" for 420. */
export const minuteLabel = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`
