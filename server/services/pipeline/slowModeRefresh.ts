import { sql } from 'drizzle-orm'
import { causalLocalLinearTrend } from '#shared/analysis/detrend'
import { slowMode } from '#shared/analysis/slowMode'
import { alignOnGrid } from '#shared/pipeline/alignTags'
import { alarmContext } from '#shared/pipeline/ruleMeasure'
import { unitSlowMode } from '../../db/schema'
import type { Db } from '../../utils/db'
import type { ChangeContext } from '../../utils/changeContext'
import type { StageClock } from './stageClock'
import { loadRuleRuntimes, observe, saveRuleRuntimes } from './ruleEvaluation'
import { isDatabaseUnavailable } from '../../utils/dbUnavailable'

// Advisory-lock namespace of the slow-mode stage, so one instance fits a unit at a time.
const SLOW_MODE_LOCK = 72_301
// A VAR(1) of m tags needs well over m aligned samples per window; past this many tags a unit's
// window cannot support the fit, so it is not attempted.
const MAX_SLOW_MODE_TAGS = 50

type UnitDue = { unit_id: number, tag_ids: number[], step: number, cells: number, bandwidth: number, data_end: number }

/**
 * Refits each unit's slow mode once per evaluation interval of its slowest tag, at the time all
 * its tags have been processed to; unit rules (the slow-mode recovery rate) are evaluated on it.
 */
export async function refreshSlowModes(db: Db, ctx: ChangeContext, clock: StageClock): Promise<number> {
  const due = await db.execute<UnitDue>(sql`
    select t.unit_id, array_agg(t.id order by t.id) as tag_ids, max(t.sample_period_s)::float8 as step,
      min(s.window_samples)::int as cells, max(s.detrend_bandwidth_s)::float8 as bandwidth,
      extract(epoch from min(st.last_sample_time))::float8 as data_end
    from tags t
    join indicator_settings s on s.tag_id = t.id
    join tag_analysis_state st on st.tag_id = t.id
    where t.watched
    group by t.unit_id
    having count(*) between 2 and ${MAX_SLOW_MODE_TAGS} and min(st.last_sample_time) is not null
      and min(st.last_sample_time) >= coalesce((select max(u.time) from unit_slow_mode u where u.unit_id = t.unit_id), '-infinity'::timestamptz)
        + make_interval(secs => max(s.evaluate_every * t.sample_period_s))`)
  let refreshed = 0
  for (const unit of due) {
    const done = await db.transaction(async (tx) => {
      const [lock] = await tx.execute<{ ok: boolean }>(sql`select pg_try_advisory_xact_lock(${SLOW_MODE_LOCK}, ${unit.unit_id}) as ok`)
      if (!lock?.ok) return false
      const series = await Promise.all(unit.tag_ids.map(async (tagId) => {
        const rows = await tx.execute<{ t: number, v: number }>(sql`
          select extract(epoch from time)::float8 as t, value as v from samples
          where tag_id = ${tagId} and quality < 2 and time <= to_timestamp(${unit.data_end})
            and time > to_timestamp(${unit.data_end - (unit.cells + 1) * unit.step - 5 * unit.bandwidth})
          order by time`)
        return { times: rows.map(r => Number(r.t)), values: rows.map(r => Number(r.v)) }
      }))
      const fit = clock.sync('unit slow mode', () => {
        const warmCells = Math.ceil(5 * unit.bandwidth / unit.step)
        const aligned = alignOnGrid(series, unit.data_end, unit.step, unit.cells + warmCells)
        if (aligned.times.length < Math.max(50, unit.tag_ids.length + 10) + warmCells / 2) return null
        const residuals = aligned.values.map((v) => {
          const trend = causalLocalLinearTrend(aligned.times, v, unit.bandwidth)
          return v.map((x, i) => x - trend[i]!).slice(-unit.cells)
        })
        return slowMode(residuals, unit.step)
      })
      if (!fit) return false
      const time = new Date(Math.round(unit.data_end * 1000))
      await tx.insert(unitSlowMode).values({
        unitId: unit.unit_id, time, recoveryRate: fit.recoveryRate,
        shares: Object.fromEntries(unit.tag_ids.map((id, j) => [String(id), fit.shares[j]!])),
      }).onConflictDoNothing()
      const runtimes = await loadRuleRuntimes(tx, { unitId: unit.unit_id })
      // |μ| ≥ 1: no recovery seen at all, the slowest possible rate.
      for (const rt of runtimes) await observe(tx, rt, unit.data_end, fit.recoveryRate ?? 0, () => alarmContext(null), ctx)
      await saveRuleRuntimes(tx, runtimes)
      return true
    }).catch((err) => {
      if (isDatabaseUnavailable(err)) throw err
      console.error(`[pipeline] slow mode of unit ${unit.unit_id}:`, err)
      return false
    })
    if (done) refreshed++
  }
  return refreshed
}
