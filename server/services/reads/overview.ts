import type { TagStatus } from '#shared/alarms/vocabulary'
import type { OverviewUnit, SetAsideAlarm } from '#shared/types/overview'
import { defaultIndicatorSettings, evaluationIntervalS } from '#shared/pipeline/indicatorDefaults'
import { tagDecimals } from '#shared/utils/numberText'
import { tileStatus } from '#shared/utils/tileStatus'
import type { Db } from '../../utils/db'
import { overviewSparklines } from './overviewSparklines'

interface OverviewRow {
  id: number, code: string, description: string, engineeringUnit: string, samplePeriodS: number
  rangeLow: number, rangeHigh: number
  unitId: number, unitCode: string, unitName: string
  latestTime: string | null, latestValue: number | null
  status: TagStatus | null, reason: string | null, leadingIndicator: string | null, leadingValue: number | null
  tau: number | null, pValue: number | null, foldKind: 'projected' | 'none' | null
  foldSeconds: number | null, foldLowSeconds: number | null, foldHighSeconds: number | null
  unackedAlarms: number | null, returnedUnacked: number | null, openAlarmClass: 'alarm' | 'alert' | null, openAlarmName: string | null
  openAlarmAction: string | null, setAside: SetAsideAlarm[] | null
  trendTestedAt: string | null, evaluateEvery: number | null
}

/**
 * Every watched tag with its newest sample, pipeline status and open alarms, in one query: the
 * cost is one index probe per tag on the samples primary key, never a scan.
 */
async function readOverviewRows(db: Db): Promise<OverviewRow[]> {
  return db.$sql<OverviewRow[]>`
    select t.id, t.code, t.description, t.engineering_unit as "engineeringUnit", t.sample_period_s as "samplePeriodS", t.range_low as "rangeLow", t.range_high as "rangeHigh",
      u.id as "unitId", u.code as "unitCode", u.name as "unitName",
      latest.time as "latestTime", latest.value as "latestValue",
      ts.status, ts.reason, ts.leading_indicator as "leadingIndicator", ts.leading_value as "leadingValue",
      ts.tau, ts.p_value as "pValue", ts.fold_kind as "foldKind", ts.fold_seconds as "foldSeconds",
      ts.fold_low_seconds as "foldLowSeconds", ts.fold_high_seconds as "foldHighSeconds",
      coalesce(unacked.n, 0)::int as "unackedAlarms", coalesce(unacked.returned, 0)::int as "returnedUnacked",
      unacked.open_class as "openAlarmClass", unacked.open_name as "openAlarmName", unacked.open_action as "openAlarmAction",
      unacked.set_aside as "setAside",
      st.last_evaluated_time as "trendTestedAt", ins.evaluate_every as "evaluateEvery"
    from tags t
    join units u on u.id = t.unit_id
    left join tag_status ts on ts.tag_id = t.id
    left join tag_analysis_state st on st.tag_id = t.id
    left join indicator_settings ins on ins.tag_id = t.id
    -- Read live (not from tag_status) so an acknowledgement or a new alarm shows on the next poll.
    -- The open alarm shown is the most severe annunciated one: alarm class before alert.
    left join (
      select a.tag_id,
        count(*) filter (where a.state in ('unacknowledged', 'rtn_unacknowledged')) as n,
        count(*) filter (where a.state = 'rtn_unacknowledged') as returned,
        (array_agg(r.operator_action order by a.class = 'alarm' desc, a.activated_at desc) filter (where a.state in ('unacknowledged', 'acknowledged')))[1] as open_action,
        -- Set aside (shelved, suppressed, out of service): listed on the tile, live excursions first.
        json_agg(json_build_object('alarmId', a.id, 'state', a.state, 'name', r.name, 'conditionActive', a.condition_active, 'until', a.shelved_until)
          order by a.condition_active desc, a.id) filter (where a.state in ('shelved', 'suppressed', 'out_of_service')) as set_aside,
        (array_agg(a.class order by a.class = 'alarm' desc, a.activated_at desc) filter (where a.state in ('unacknowledged', 'acknowledged')))[1] as open_class,
        (array_agg(r.name order by a.class = 'alarm' desc, a.activated_at desc) filter (where a.state in ('unacknowledged', 'acknowledged')))[1] as open_name
      from alarms a join alarm_rules r on r.id = a.rule_id
      where a.state <> 'normal' and a.tag_id is not null
      group by a.tag_id) unacked on unacked.tag_id = t.id
    left join lateral (select s.time, s.value from samples s where s.tag_id = t.id order by s.time desc limit 1) latest on true
    where t.watched
    order by u.code, t.code`
}

export async function readOverview(db: Db, nowMs = Date.now()): Promise<{ generatedAt: string, units: OverviewUnit[] }> {
  const [rows, sparklines] = await Promise.all([readOverviewRows(db), overviewSparklines(db)])
  const units: OverviewUnit[] = []
  for (const row of rows) {
    let unit = units.at(-1)
    if (unit?.id !== row.unitId) units.push(unit = { id: row.unitId, code: row.unitCode, name: row.unitName, tiles: [] })
    const latestTimeMs = row.latestTime === null ? null : new Date(row.latestTime).getTime()
    const stored = row.status === null ? null : { status: row.status, reason: row.reason ?? '' }
    const openAlarm = row.openAlarmClass ? { alarmClass: row.openAlarmClass, name: row.openAlarmName ?? '' } : null
    const { status, reason } = tileStatus({ stored, latestTimeMs, samplePeriodS: row.samplePeriodS, nowMs, openAlarm })
    unit.tiles.push({
      id: row.id, code: row.code, description: row.description, engineeringUnit: row.engineeringUnit,
      decimals: tagDecimals(Number(row.rangeLow), Number(row.rangeHigh)),
      status, reason,
      value: row.latestValue === null ? null : Number(row.latestValue),
      valueTime: latestTimeMs === null ? null : new Date(latestTimeMs).toISOString(),
      spark: sparklines.get(row.id) ?? [],
      leadingIndicator: row.leadingIndicator, leadingValue: row.leadingValue, tau: row.tau, pValue: row.pValue,
      trendTestedAt: row.trendTestedAt === null ? null : new Date(row.trendTestedAt).toISOString(),
      trendEverySeconds: evaluationIntervalS(
        { evaluateEvery: row.evaluateEvery ?? defaultIndicatorSettings(row.samplePeriodS).evaluateEvery }, row.samplePeriodS),
      fold: row.foldKind === 'projected' && row.foldSeconds !== null
        ? { kind: 'projected', seconds: row.foldSeconds, lowSeconds: row.foldLowSeconds, highSeconds: row.foldHighSeconds }
        : { kind: 'none' },
      unackedAlarms: row.unackedAlarms ?? 0,
      returnedUnacked: row.returnedUnacked ?? 0,
      action: row.openAlarmAction,
      setAside: (row.setAside ?? []).map(s => ({ ...s, alarmId: Number(s.alarmId) })),
    })
  }
  return { generatedAt: new Date(nowMs).toISOString(), units }
}
