// One live pipeline tick over 1,000 tags (time and share per stage), and sample-to-mail latency
// in ticks (goal, DESIGN.md §9: ≤ 2 ticks). The tags are 1 Hz OU series with the history their
// windows need already processed, as on a running plant; each tick brings 10 s of new samples.
import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import type postgres from 'postgres'
import { startLocalMailbox } from '../../simulators/localMailbox'
import { defaultIndicatorSettings } from '../../shared/pipeline/indicatorDefaults'
import { startStack } from './support/stack'

const TAGS = 1000
const HISTORY = 1500
const NEW_PER_TICK = 10
const START = Date.UTC(2031, 0, 1)
// The tick's default schedule in nuxt.config.ts (every 10 s): a tick must end well within it.
const TICK_INTERVAL_MS = 10_000

/** 1 Hz Ornstein–Uhlenbeck samples (k = 0.05 s⁻¹), COPY'd straight into samples. */
async function copySamples(sql: postgres.Sql, tagIds: number[], fromSecond: number, count: number, state: Map<number, number>) {
  const phi = Math.exp(-0.05)
  const lines = function* () {
    for (const id of tagIds) {
      let x = state.get(id) ?? 0
      let chunk = ''
      for (let s = fromSecond; s < fromSecond + count; s++) {
        const z = Math.sqrt(-2 * Math.log(Math.random() || 1e-12)) * Math.cos(2 * Math.PI * Math.random())
        x = phi * x + Math.sqrt(1 - phi * phi) * z
        chunk += `${id}\t${new Date(START + s * 1000).toISOString()}\t${(50 + x).toFixed(4)}\t0\n`
      }
      state.set(id, x)
      yield chunk
    }
  }
  await pipeline(Readable.from(lines()), await sql`copy samples (tag_id, time, value, quality) from stdin`.writable())
}

async function tick(url: string, task: string) {
  const res = await fetch(`${url}/api/public/test/run-task`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ task }) })
  if (res.status !== 200) throw new Error(`${task} answered ${res.status}: ${await res.text()}`)
  return (await res.json() as { result: Record<string, unknown> }).result
}

function printTick(label: string, report: Record<string, unknown>) {
  const stages = report.stages as Record<string, number>
  // Tags run on a few concurrent workers, so stage times are summed over them: shares are of
  // that sum, not of the wall time.
  const summed = Object.values(stages).reduce((a, b) => a + b, 0)
  const ms = report.ms as number
  console.log(`${label}: ${ms} ms wall for ${report.tags} tags, ${report.samples} samples, ${report.evaluations} evaluations`)
  console.log(`  headroom: ${(TICK_INTERVAL_MS / ms).toFixed(1)} such ticks fit in the ${TICK_INTERVAL_MS / 1000} s interval (${(100 * ms / TICK_INTERVAL_MS).toFixed(0)} % of it used)`)
  for (const [stage, ms] of Object.entries(stages).sort((a, b) => b[1] - a[1]))
    console.log(`  ${stage.padEnd(24)} ${String(Math.round(ms)).padStart(7)} ms  ${(100 * ms / summed).toFixed(0).padStart(3)} % of summed stage time`)
}

export async function run(): Promise<void> {
  const mailbox = await startLocalMailbox({ smtpPort: 0, httpPort: 0, dir: mkdtempSync(join(tmpdir(), 'brinkline-bench-mail-')) })
  const stack = await startStack({
    BRINKLINE_TEST_ROUTES: '1', NUXT_PIPELINE_SCHEDULED: 'false', NUXT_SENDER_SCHEDULED: 'false',
    NUXT_SMTP_URL: `smtp://127.0.0.1:${mailbox.smtpPort}`,
  })
  const { sql, url } = stack
  try {
    // Only the bench tags are watched, so the tick measures them alone.
    await sql`update tags set watched = false`
    const [unit] = await sql`insert into units (site_id, code, name, kind) select id, 'BENCH', 'Bench unit', 'bench' from sites limit 1 returning id, site_id`
    const tags = await sql<{ id: number }[]>`
      insert into tags (site_id, unit_id, code, description, engineering_unit, sample_period_s, range_low, range_high)
      select ${unit!.site_id}, ${unit!.id}, 'BX-' || lpad(g::text, 4, '0'), 'Bench signal', 'K', 1, 0, 100 from generate_series(1, ${TAGS}) g
      returning id`
    const ids = tags.map(t => t.id)
    const state = new Map<number, number>()
    let t0 = performance.now()
    await copySamples(sql, ids, 0, HISTORY, state)
    console.log(`history: ${(TAGS * HISTORY).toLocaleString('en')} samples in ${Math.round(performance.now() - t0)} ms (COPY)`)
    // Claims at the end of the history, staggered as a running pipeline leaves them.
    const settings = defaultIndicatorSettings(1)
    await sql`insert into indicator_settings ${sql(ids.map(tagId => ({ tag_id: tagId, window_samples: settings.windowSamples, detrend_bandwidth_s: settings.detrendBandwidthS, trend_window_samples: settings.trendWindowSamples, indicator_step: settings.indicatorStep, evaluate_every: settings.evaluateEvery, surrogates: settings.surrogates, alpha: settings.alpha, min_tau: settings.minTau })))}`
    await sql`insert into tag_analysis_state ${sql(ids.map((tagId, i) => ({ tag_id: tagId, last_sample_time: new Date(START + (HISTORY - 1) * 1000), samples_since_evaluation: i % settings.evaluateEvery })))}`
    let second = HISTORY
    await copySamples(sql, ids, second, NEW_PER_TICK, state)
    second += NEW_PER_TICK
    printTick(`live tick (${NEW_PER_TICK} new samples per tag, every ${settings.evaluateEvery}th sample evaluates)`, await tick(url, 'indicators:refresh'))
    await sql`update tag_analysis_state set samples_since_evaluation = ${settings.evaluateEvery - 1} where tag_id = any(${ids})`
    await copySamples(sql, ids, second, NEW_PER_TICK, state)
    second += NEW_PER_TICK
    printTick(`worst tick (every tag evaluates: ${settings.surrogates} surrogates over ${settings.trendWindowSamples} samples)`, await tick(url, 'indicators:refresh'))

    // Sample → mail: a plain high limit on one tag, the crossing sample posted, then ticks.
    const [rule] = await sql`insert into alarm_rules (site_id, target_kind, tag_id, unit_id, name, measure, comparison, threshold, priority, class, consequence, likely_cause, operator_action)
      values (${unit!.site_id}, 'tag', ${ids[0]!}, ${unit!.id}, 'Bench limit', 'value', 'above', 1000, 'urgent', 'alarm', 'Bench.', 'Bench.', 'Bench.') returning id`
    await sql`insert into samples (tag_id, time, value) values (${ids[0]!}, ${new Date(START + second * 1000)}, 2000)`
    t0 = performance.now()
    let ticks = 0
    for (; ticks < 5; ) {
      ticks++
      await tick(url, 'indicators:refresh')
      await tick(url, 'notifications:send')
      const mails = await (await fetch(`http://127.0.0.1:${mailbox.httpPort}/api/messages`)).json() as { subject: string }[]
      if (mails.some(m => m.subject.includes('BX-0001'))) break
    }
    console.log(`sample → mail: ${ticks} tick(s) (goal ≤ 2), ${Math.round(performance.now() - t0)} ms of tick work (rule ${rule!.id})`)
  }
  finally {
    await stack.stop()
    await mailbox.close()
  }
}
