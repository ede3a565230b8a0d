import { INCIDENT_TIMELINE_MAX_TAGS } from '#shared/schemas/incident'
import type { TimelineEntry } from '#shared/utils/incidentEventsCsv'
import type { Db } from '../../utils/db'
import { readTagSeriesBetween } from '../reads/tagSeriesRead'
import { judgementStrip } from './incidentJudgement'
import { incidentDetail } from './incidentReads'
import { ReviewInputError } from './reviewErrors'

const MIN_MS = 60_000
/** Lead-in before the first alarm (the approach) and run-out after the last event. */
const BEFORE_MS = 30 * MIN_MS
const AFTER_MS = 15 * MIN_MS
/** At most a week on one axis. */
const MAX_SPAN_MS = 7 * 24 * 60 * MIN_MS

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
async function notesAbout(
  db: Db, incident: { id: number, siteId: number, unitId: number }, from: number, to: number,
): Promise<TimelineEntry[]> {
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

export interface TimelineTagChoice { id: number, code: string, description: string, watchedByAlarm: boolean, retired: boolean }

/** Every tag of the incident's unit (and any other tag its alarms watch), those the alarms watch first. */
async function tagChoices(db: Db, unitId: number, alarmTagIds: number[]): Promise<TimelineTagChoice[]> {
  const rows = await db.$sql<{ id: number, code: string, description: string, retired: boolean }[]>`
    select id, code, description, retired_at is not null as retired from tags
    where unit_id = ${unitId} or id = any(${db.$sql.array(alarmTagIds)}::int[]) order by code, id`
  const watched = new Set(alarmTagIds)
  const choices = rows.map(r => ({ ...r, id: Number(r.id), watchedByAlarm: watched.has(Number(r.id)) }))
  return [...choices.filter(c => c.watchedByAlarm), ...choices.filter(c => !c.watchedByAlarm)]
}

/** The tags asked for (each must be a choice), else the first ones the alarms watch. */
function chartedTags(choices: TimelineTagChoice[], asked: number[] | undefined): number[] {
  if (asked === undefined) return choices.filter(c => c.watchedByAlarm).slice(0, INCIDENT_TIMELINE_MAX_TAGS).map(c => c.id)
  const known = new Set(choices.map(c => c.id))
  const unknown = asked.find(t => !known.has(t))
  if (unknown !== undefined) throw new ReviewInputError('tags', 400, `tag ${unknown} is not a tag of the incident's unit`)
  return asked
}

/**
 * The incident on one time axis: from half an hour before its first alarm to a quarter hour after
 * its last event (at most a week, never past now), the charted tags' values, indicators and stored
 * early-warning judgement (at most four, picked from the unit's tags), every alarm event with who
 * and comment, and the shift-log notes about it.
 */
export async function incidentTimeline(db: Db, id: number, options: { series?: boolean, tags?: number[], nowMs?: number } = {}) {
  const nowMs = options.nowMs ?? Date.now()
  const incident = await incidentDetail(db, id)
  if (!incident) return undefined
  const events = await alarmEvents(db, id)
  const first = Math.min(...incident.members.map(m => m.raisedAt.getTime()))
  const last = Math.max(first, ...events.map(e => Date.parse(e.at)))
  const from = first - BEFORE_MS
  const to = Math.min(nowMs, from + MAX_SPAN_MS, last + AFTER_MS)
  const notes = await notesAbout(db, incident, from, to)
  const entries = [...events, ...notes].sort((a, b) => a.at.localeCompare(b.at))
  const spanIso = { from: new Date(from).toISOString(), to: new Date(to).toISOString() }
  if (options.series === false) return { incident, span: spanIso, entries, tagChoices: [], series: [], judgement: [] }
  const alarmTagIds = [...new Set(incident.members.map(m => m.tagId).filter((t): t is number => t !== null))]
  const choices = await tagChoices(db, incident.unitId, alarmTagIds)
  const charted = chartedTags(choices, options.tags)
  const [series, judgement] = await Promise.all([
    Promise.all(charted.map(t => readTagSeriesBetween(db, t, from / 1000, to / 1000))),
    Promise.all(charted.map(t => judgementStrip(db, t, from, to))),
  ])
  return { incident, span: spanIso, entries, tagChoices: choices, series: series.filter(s => s !== undefined), judgement }
}
