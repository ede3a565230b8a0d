import type postgres from 'postgres'
import { CATALOGUE, type CatalogueUnit } from '../../shared/demo/catalogue'
import { seededNormal } from '../../simulators/lib/random'
import { UnitSampler } from '../../simulators/lib/unitSampler'
import { createUnit } from '../../simulators/units/createUnit'
import { DEMO_RULES, demoRuleColumns } from '../../server/services/demo/demoAlarmRules'
import { createTestTag } from './pipeline'
import { call } from './session'

// The demo plant's units and rules, for tests that run them through the server under names of their own.

/**
 * Fixed sample times: the live path seeds its surrogates from (tag, evaluation time), so fixed
 * times make each run draw the same surrogates and the outcome reproducible, not 97 % likely.
 */
export const FIXED_START_MS = Date.UTC(2026, 0, 5, 0, 0, 0)

/** Creates a test tag and gives it the demo rules of `demoTag` (same thresholds and rationale), as `engineer`. */
export async function tagWithDemoRules(
  sql: postgres.Sql, engineer: string, code: string, unitCode: string, samplePeriodS: number, demoTag: string,
): Promise<number> {
  const id = await createTestTag(sql, code, unitCode, samplePeriodS)
  const [tag] = await sql`select id, unit_id as "unitId", sample_period_s as "samplePeriodS" from tags where id = ${id}`
  for (const rule of DEMO_RULES.filter(r => r.tag === demoTag)) {
    const body = { ...demoRuleColumns(rule, tag as { id: number, unitId: number, samplePeriodS: number }), name: `${rule.name} (${code})` }
    const res = await call('/api/rules', { method: 'POST', cookie: engineer, json: body })
    if (res.status !== 201) throw new Error(`rule create answered ${res.status}: ${JSON.stringify(res.body)}`)
  }
  return id
}

/** A demo unit read through its sensors, sampled as given (null: the catalogue's periods). */
export function simulateDemoUnit(unitCode: CatalogueUnit['code'], samplePeriodS: number | null, seed: number) {
  const base = CATALOGUE.find(u => u.code === unitCode)!
  const catalogue = { ...base, tags: base.tags.map(t => ({ ...t, samplePeriodSeconds: samplePeriodS ?? t.samplePeriodSeconds })) }
  const unit = createUnit(unitCode, { speed: 1, normal: seededNormal(seed) })
  return { unit, sampler: new UnitSampler(unit, catalogue, seededNormal(seed + 100), 0) }
}

/**
 * The demo load bus (docs/science.md §S10.2, two-bus model with load restoration) driven until it
 * tips: its voltage and power samples (epoch ms, as simulated) and the minute it tipped.
 */
export function busToCollapse(seed = 1, limitMs = 3 * 3_600_000) {
  const { unit, sampler } = simulateDemoUnit('grid', null, seed)
  const samples: { tag: string, time: number, value: number }[] = []
  let tipMs: number | null = null
  for (let ms = 60_000; ms <= limitMs && tipMs === null; ms += 60_000) {
    for (const s of sampler.samplesUntil(ms)) samples.push({ tag: s.tag, time: Date.parse(s.time), value: s.value })
    if (unit.cycle?.phase === 'tipped') tipMs = ms
  }
  return { samples, tipMs }
}
