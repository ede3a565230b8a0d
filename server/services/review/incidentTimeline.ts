import type { TimelineEntry } from '#shared/utils/incidentEventsCsv'
import type { Db } from '../../utils/db'
import { readTagSeriesBetween } from '../reads/tagSeriesRead'
import { incidentDetail } from './incidentReads'

const MIN_MS = 60_000
/** Lead-in before the first alarm (the approach) and run-out after the last event. */
const BEFORE_MS = 30 * MIN_MS
const AFTER_MS = 15 * MIN_MS
/** At most a week on one axis; tags charted at most four (the ones the alarms watch). */
const MAX_SPAN_MS = 7 * 24 * 60 * MIN_MS
const MAX_TAGS = 4

type EventRow = {
  alarmId: string, at: string, event: string, fromState: string | null, toState: string, actor: string, userName: string | null,
  comment: string, value: number | null, ruleName: string, priority: string, alarmClass: string
}

/** Every lifecycle event of the incident's alarms, each re-activation numbered, oldest first. */
async function alarmEvents(db: Db, incidentId: number): Promise<TimelineEntry[]> {
  const rows = await db.$sql<EventRow[]>`
    select e.alarm_id as "alarmId", coalesce(e.condition_time, e.at) as at, e.event, e.from_state as "fromState", e.to_state as "toState",
      e.actor, u.name as "userName", e.comment, e.value, r.name as "ruleName", a.priority, a.class as "alarmClass"
    from alarm_events e join incident_alarms ia on ia.alarm_id = e.alarm_id join alarms a on a.id = e.alarm_id
    join alarm_rules r on r.id = a.rule_id left join users u on u.id = e.user_id
    where ia.incident_id = ${incidentId} order by e.alarm_id, e.id`
  const activations = new Map<string, number>()
  const entries = rows.map((r) => {
    let event = r.event
    if (r.event === 'activate') {
      const n = (activations.get(r.alarmId) ?? 0) + 1
      activations.set(r.alarmId, n)
      if (n > 1) event = `re-activate #${n}`
    }
    return {
      at: new Date(r.at).toISOString(), kind: 'alarm event' as const, alarmId: Number(r.alarmId), name: r.ruleName, priority: r.priority,
      alarmClass: r.alarmClass, event, fromState: r.fromState, toState: r.toState,
      who: r.userName ?? (r.actor === 'system' ? 'system' : r.actor), text: r.comment, value: r.value,
    }
  })
  return entries.sort((a, b) => a.at.localeCompare(b.at))
}

/** Shift-log notes in the span about the incident's unit, its tags or its alarms. */
async function notesAbout(db: Db, incident: { id: number, siteId: number, unitId: number }, from: number, to: number): Promise<TimelineEntry[]> {
  const rows = await db.$sql<{ at: string, body: string, authorName: string | null, alarmId: string | null, tagCode: string | null }[]>`
    select n.at, n.body, us.name as "authorName", n.alarm_id as "alarmId", t.code as "tagCode"
    from shift_log_notes n left join users us on us.id = n.author_id left join tags t on t.id = n.tag_id
    where n.site_id = ${incident.siteId} and n.at >= ${new Date(from).toISOString()}::timestamptz and n.at <= ${new Date(to).toISOString()}::timestamptz
      and (n.unit_id = ${incident.unitId} or n.alarm_id in (select alarm_id from incident_alarms where incident_id = ${incident.id})
        or n.tag_id in (select a.tag_id from incident_alarms ia join alarms a on a.id = ia.alarm_id where ia.incident_id = ${incident.id}))
    order by n.at, n.id`
  return rows.map(r => ({
    at: new Date(r.at).toISOString(), kind: 'shift-log note' as const, alarmId: r.alarmId === null ? null : Number(r.alarmId),
    name: r.tagCode ?? 'note', priority: null, alarmClass: null, event: 'note', fromState: null, toState: null,
    who: r.authorName ?? 'unknown', text: r.body, value: null,
  }))
}

/**
 * The incident on one time axis: from half an hour before its first alarm to a quarter hour after
 * its last event (at most a week, never past now), the watched tags' values and indicators, every
 * alarm event with who and comment, and the shift-log notes about it.
 */
export async function incidentTimeline(db: Db, id: number, options: { series?: boolean, nowMs?: number } = {}) {
  const nowMs = options.nowMs ?? Date.now()
  const incident = await incidentDetail(db, id)
  if (!incident) return undefined
  const events = await alarmEvents(db, id)
  const first = Math.min(...incident.members.map(m => m.raisedAt.getTime()))
  const last = Math.max(first, ...events.map(e => Date.parse(e.at)))
  const from = first - BEFORE_MS
  const to = Math.min(nowMs, from + MAX_SPAN_MS, last + AFTER_MS)
  const notes = await notesAbout(db, incident, from, to)
  const tagIds = [...new Set(incident.members.map(m => m.tagId).filter((t): t is number => t !== null))].slice(0, MAX_TAGS)
  const charted = options.series === false ? [] : tagIds
  const series = (await Promise.all(charted.map(t => readTagSeriesBetween(db, t, from / 1000, to / 1000, { atMostPerSample: true })))).filter(s => s !== undefined)
  const entries = [...events, ...notes].sort((a, b) => a.at.localeCompare(b.at))
  return { incident, span: { from: new Date(from).toISOString(), to: new Date(to).toISOString() }, entries, series }
}
