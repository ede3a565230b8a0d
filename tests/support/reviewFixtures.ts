import type postgres from 'postgres'

// Alarm history written straight into the test database, for the review's figures: each test
// states its event sequence, so the expected answer follows from the standards' definitions.
type Sql = postgres.Sql
export interface FixtureEvent { at: number, event: string, from: string | null, to: string, userId?: number, comment?: string }

let ruleSeq = 0
/** A rule of the demo site on unit `unitCode` (on tag `tagCode` when given), with its rationale. */
type RuleFixture = { unitCode: string, tagCode?: string, priority?: string, alarmClass?: string, measure?: string, name?: string }
export async function insertRule(sql: Sql, opts: RuleFixture): Promise<number> {
  const name = opts.name ?? `review fixture ${++ruleSeq} ${Math.random().toString(36).slice(2, 8)}`
  const [row] = await sql`
    insert into alarm_rules (site_id, target_kind, tag_id, unit_id, name, measure, comparison, threshold, priority, class, consequence, likely_cause, operator_action)
    select u.site_id, ${opts.tagCode ? 'tag' : 'unit'}, (select id from tags where code = ${opts.tagCode ?? null}), u.id, ${name}, ${opts.measure ?? 'value'}, 'above', 1, ${opts.priority ?? 'low'}, ${opts.alarmClass ?? 'alarm'},
      'Fixture consequence.', 'Fixture cause.', 'Fixture action.'
    from units u where u.code = ${opts.unitCode} returning id`
  return row!.id as number
}

/** One occurrence of `ruleId` with its events (the first must be the activation); closed at `closedAt`. */
export async function insertOccurrence(sql: Sql, ruleId: number, events: FixtureEvent[], closedAt: number | null): Promise<number> {
  const raisedAt = new Date(events[0]!.at).toISOString()
  const state = closedAt === null ? events.at(-1)!.to : 'normal'
  const [row] = await sql`
    insert into alarms (rule_id, site_id, unit_id, tag_id, priority, class, measure, comparison, threshold, state, condition_active, raised_at, activated_at, closed_at)
    select r.id, r.site_id, r.unit_id, r.tag_id, r.priority, r.class, r.measure, r.comparison, r.threshold, ${state}, ${closedAt === null},
      ${raisedAt}::timestamptz, ${raisedAt}::timestamptz, ${closedAt === null ? null : new Date(closedAt).toISOString()}::timestamptz
    from alarm_rules r where r.id = ${ruleId} returning id`
  const alarmId = Number(row!.id)
  for (const e of events) {
    await sql`insert into alarm_events (alarm_id, at, condition_time, event, from_state, to_state, actor, user_id, comment)
      values (${alarmId}, ${new Date(e.at).toISOString()}::timestamptz, ${new Date(e.at).toISOString()}::timestamptz,
        ${e.event}, ${e.from}, ${e.to}, ${e.userId ? `user:${e.userId}` : 'system'}, ${e.userId ?? null}, ${e.comment ?? ''})`
  }
  return alarmId
}

export const activation = (at: number): FixtureEvent => ({ at, event: 'activate', from: 'normal', to: 'unacknowledged' })
/** Activated at `at`, back to normal unacknowledged a second later, closed then. */
export async function oneShot(sql: Sql, ruleId: number, at: number): Promise<number> {
  return insertOccurrence(sql, ruleId, [activation(at), { at: at + 1000, event: 'return', from: 'unacknowledged', to: 'rtn_unacknowledged' }], at + 1000)
}
