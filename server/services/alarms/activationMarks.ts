import type { Db } from '../../utils/db'
// Chart markers for alarms: one per activation of an occurrence, so a re-raised alarm shows
// where it came back, not only where it first began (issue 12 item 1). Read by the tag and unit
// chart routes; the supervisor's incident timeline reads the same activation events.

export interface ActivationMark {
  alarmId: number
  /** Epoch seconds of the sample that completed the condition. */
  time: number
  priority: string
  alarmClass: string
  /** 1 for the first activation of the occurrence, 2 for the first re-activation, … */
  activation: number
}

/** Activations in [fromS, toS] of a tag's alarms, or of a unit's own (tag-less) alarms, oldest first. */
export async function findActivationMarks(
  db: Db, target: { tagId: number } | { unitId: number }, fromS: number, toS: number,
): Promise<ActivationMark[]> {
  const where = 'tagId' in target
    ? db.$sql`a.tag_id = ${target.tagId}`
    : db.$sql`a.unit_id = ${target.unitId} and a.tag_id is null`
  const rows = await db.$sql<{ alarmId: string, time: number, priority: string, alarmClass: string, activation: number }[]>`
    select * from (
      select e.alarm_id as "alarmId", extract(epoch from coalesce(e.condition_time, e.at))::float8 as time,
        a.priority, a.class as "alarmClass",
        (row_number() over (partition by e.alarm_id order by e.id))::int as activation
      from alarm_events e join alarms a on a.id = e.alarm_id
      where ${where} and e.event = 'activate'
        and a.activated_at >= to_timestamp(${fromS}) and a.raised_at <= to_timestamp(${toS})
    ) marks
    where time between ${fromS} and ${toS}
    order by time`
  return rows.map(r => ({ ...r, alarmId: Number(r.alarmId) }))
}
