import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer, startServerInstance, type ServerInstance } from '../support/server'
import { call, signInAs } from '../support/session'

// Two server instances on one database, as two machines behind a load balancer (docs/scale-out.md):
// the pipeline's tag work is shared through row claims taken FOR UPDATE SKIP LOCKED, so ticks that
// run at the same moment on both never process a tag twice. SKIP LOCKED semantics: PostgreSQL
// manual, SELECT "The Locking Clause" [from memory].

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
let second: ServerInstance
afterAll(async () => { await sql.end() })

const TAGS = 60
const ROUNDS = 4
const SAMPLES_PER_ROUND = 100
const RULE_TAGS = 10
const codes = Array.from({ length: TAGS }, (_, i) => `TW-${500 + i}`)
const tagIds: number[] = []
const t0 = Date.now() - 3_600_000

beforeAll(async () => {
  await waitForDemoSite(sql)
  second = await startServerInstance()
  for (const code of codes) tagIds.push(await createTestTag(sql, code, 'R-100', 1))
  // One limit rule on some tags: the value crosses it once, so each of them must raise one alarm.
  const cookie = await signInAs('engineer')
  for (const tagId of tagIds.slice(0, RULE_TAGS)) {
    const res = await call('/api/rules', { method: 'POST', cookie, json: {
      targetKind: 'tag', tagId, name: `Two-instance limit ${tagId}`, measure: 'value', comparison: 'above', threshold: 100,
      priority: 'low', alarmClass: 'alarm', consequence: 'Test signal high.', likelyCause: 'Test step.',
      operatorAction: 'Check the test signal.', timeToRespondS: 600,
    } })
    if (res.status !== 201) throw new Error(`rule create answered ${res.status}: ${JSON.stringify(res.body)}`)
  }
})

/** A wavering signal that steps above the limit half-way through the run and stays there. */
const STEP_AT = ROUNDS * SAMPLES_PER_ROUND / 2
function samplesOfRound(round: number) {
  const samples: { tag: string, time: string, value: number }[] = []
  for (let k = 0; k < SAMPLES_PER_ROUND; k++) {
    const i = round * SAMPLES_PER_ROUND + k
    for (const [j, tag] of codes.entries())
      samples.push({ tag, time: new Date(t0 + i * 1000).toISOString(), value: (i >= STEP_AT ? 150 : 50) + Math.sin(i * 0.37 + j) })
  }
  return samples
}

describe('two server instances on one database share the pipeline\'s tag work', () => {
  it('processes every sample exactly once, stores each indicator point and alarm once, and both instances work', async () => {
    const bases = [url('/').replace(/\/$/, ''), second.url]
    const done = new Map(bases.map(base => [base, { samples: 0, evaluations: 0 }]))
    const tickOn = async (base: string) => {
      const report = await runServerTask('indicators:refresh', base)
      done.get(base)!.samples += report.samples
      done.get(base)!.evaluations += report.evaluations
    }
    for (let round = 0; round < ROUNDS; round++) {
      await ingestAll(samplesOfRound(round))
      // Both ticks start together; each claims the tags the other does not hold.
      await Promise.all(bases.map(tickOn))
      // Whatever a tick left (it found a batch locked and skipped it), a later tick on either picks up.
      const newest = new Date(t0 + ((round + 1) * SAMPLES_PER_ROUND - 1) * 1000)
      for (let k = 0; k < 5; k++) {
        const [left] = await sql`select count(*)::int as n from tag_analysis_state
          where tag_id in ${sql(tagIds)} and last_sample_time is distinct from ${newest}`
        if (left!.n === 0) break
        await tickOn(bases[k % 2]!)
      }
    }
    const total = { samples: 0, evaluations: 0 }
    for (const d of done.values()) { total.samples += d.samples; total.evaluations += d.evaluations }
    // Every stored sample was read by exactly one tick: a tag processed twice would count twice.
    expect(total.samples).toBe(TAGS * ROUNDS * SAMPLES_PER_ROUND)
    // Points are keyed (tag, time) and stored with ON CONFLICT DO NOTHING, so a duplicate would
    // vanish from the table: the evaluations both instances report must match the rows exactly.
    const [points] = await sql`select count(*)::int as n from indicator_points where tag_id in ${sql(tagIds)}`
    expect(points!.n).toBeGreaterThan(0)
    expect(total.evaluations).toBe(points!.n)
    const alarms = await sql`select tag_id, count(*)::int as n from alarms where tag_id in ${sql(tagIds)} group by tag_id`
    expect(alarms).toHaveLength(RULE_TAGS)
    expect(alarms.every(a => a.n === 1)).toBe(true)
    const [events] = await sql`select count(*)::int as n from alarm_events e join alarms a on a.id = e.alarm_id
      where a.tag_id in ${sql(tagIds)} and e.event = 'activate'`
    expect(events!.n).toBe(RULE_TAGS)
    // Both instances did part of the work.
    for (const [base, d] of done) expect(d.samples, `${base} processed no sample`).toBeGreaterThan(0)
  })

  it('a session cookie from one instance opens the other: sessions live in the cookie, not in one process', async () => {
    const cookie = await signInAs('operator')
    expect((await call(`${second.url}/api/units`, { cookie })).status).toBe(200)
  })
})
