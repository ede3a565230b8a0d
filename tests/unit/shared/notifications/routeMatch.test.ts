import { describe, expect, it } from 'vitest'
import { localClock, routeWants, withinWorkingHours, type RouteFilter } from '../../../../shared/notifications/routeMatch'

const route: RouteFilter = {
  siteId: 1, unitId: null, minPriority: 'high', alarmClasses: ['alarm'], hours: 'always',
  workStartMinute: 7 * 60, workEndMinute: 19 * 60, workDays: [1, 2, 3, 4, 5], enabled: true,
}
const alarm = { siteId: 1, unitId: 4, priority: 'urgent' as const, alarmClass: 'alarm' as const }
// 2026-03-02 is a Monday (ISO 8601 calendar); Europe/London is UTC+0 in March before the
// last Sunday, when summer time (UTC+1) starts [IANA tz database rule for the UK].
const mondayNoonUtc = new Date('2026-03-02T12:00:00Z')

describe('which routes want an alarm', () => {
  it('matches site, unit and "this priority or more urgent"', () => {
    expect(routeWants(route, alarm, mondayNoonUtc, 'UTC')).toBe(true)
    expect(routeWants(route, { ...alarm, priority: 'high' }, mondayNoonUtc, 'UTC')).toBe(true)
    expect(routeWants(route, { ...alarm, priority: 'medium' }, mondayNoonUtc, 'UTC')).toBe(false)
    expect(routeWants(route, { ...alarm, siteId: 2 }, mondayNoonUtc, 'UTC')).toBe(false)
    expect(routeWants({ ...route, unitId: 5 }, alarm, mondayNoonUtc, 'UTC')).toBe(false)
    expect(routeWants({ ...route, unitId: 4 }, alarm, mondayNoonUtc, 'UTC')).toBe(true)
    expect(routeWants({ ...route, enabled: false }, alarm, mondayNoonUtc, 'UTC')).toBe(false)
  })

  it('keeps alarms and advisory alerts apart (ISA-18.2 alert class)', () => {
    expect(routeWants(route, { ...alarm, alarmClass: 'alert' }, mondayNoonUtc, 'UTC')).toBe(false)
    expect(routeWants({ ...route, alarmClasses: ['alarm', 'alert'] }, { ...alarm, alarmClass: 'alert' }, mondayNoonUtc, 'UTC')).toBe(true)
  })

  it('reads working hours in the site\'s zone', () => {
    const working = { ...route, hours: 'working' as const }
    // 18:30 UTC on Monday 1 June 2026 is 19:30 in London (summer time): outside 07:00–19:00.
    expect(withinWorkingHours(working, new Date('2026-06-01T18:30:00Z'), 'UTC')).toBe(true)
    expect(withinWorkingHours(working, new Date('2026-06-01T18:30:00Z'), 'Europe/London')).toBe(false)
    expect(localClock(new Date('2026-06-01T18:30:00Z'), 'Europe/London')).toEqual({ weekday: 1, minute: 19 * 60 + 30 })
    // Saturday 7 March 2026 noon: not a working day.
    expect(withinWorkingHours(working, new Date('2026-03-07T12:00:00Z'), 'UTC')).toBe(false)
    expect(routeWants(working, alarm, new Date('2026-03-07T12:00:00Z'), 'UTC')).toBe(false)
  })

  it('lets a night window span midnight, belonging to the day it starts', () => {
    const night = { ...route, workStartMinute: 19 * 60, workEndMinute: 7 * 60, workDays: [5] }
    expect(withinWorkingHours(night, new Date('2026-03-06T20:00:00Z'), 'UTC')).toBe(true) // Friday 20:00
    expect(withinWorkingHours(night, new Date('2026-03-07T06:59:00Z'), 'UTC')).toBe(true) // Saturday 06:59, Friday's night
    expect(withinWorkingHours(night, new Date('2026-03-07T07:00:00Z'), 'UTC')).toBe(false)
    expect(withinWorkingHours(night, new Date('2026-03-07T20:00:00Z'), 'UTC')).toBe(false) // Saturday night
  })
})
