import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { testSql } from '../support/db'
import { eventually } from '../support/eventually'
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
    const newestOf = (round: number) => new Date(t0 + ((round + 1) * SAMPLES_PER_ROUND - 1) * 1000)
    for (let round = 0; round < ROUNDS; round++) {
      await ingestAll(samplesOfRound(round))
      // Both ticks start together; each claims the tags the other does not hold. Which one gets
      // how many depends on the machine: only the exact counts below are checked.
      await Promise.all(bases.map(tickOn))
      // Whatever a tick left (it found a batch locked and skipped it), a later tick on either picks up.
      for (let k = 0; k < 5; k++) {
        const [left] = await sql`select count(*)::int as n from tag_analysis_state
          where tag_id in ${sql(tagIds)} and last_sample_time is distinct from ${newestOf(round)}`
        if (left!.n === 0) break
        await tickOn(bases[k % 2]!)
      }
    }

    // The skip itself, made certain: the first instance's tick is held inside the batch of one tag
    // (the test holds that tag's status row), and the second's tick, run meanwhile, passes that
    // batch by without waiting and without processing it; released, the first finishes it.
    await ingestAll(samplesOfRound(ROUNDS))
    const held = tagIds[0]!
    const lock = await sql.reserve()
    await lock`begin`
    await lock`select 1 from tag_status where tag_id = ${held} for update`
    const first = tickOn(bases[0]!)
    await eventually('the first tick to wait on the held status row', async () => {
      const rows = await sql`select 1 from pg_stat_activity where wait_event_type = 'Lock' and query ilike '%insert into "tag_status"%'`
      return rows.length > 0 ? true : undefined
    })
    await tickOn(bases[1]!)
    const claimOf = async () => new Date((await sql`select last_sample_time as t from tag_analysis_state where tag_id = ${held}`)[0]!.t).getTime()
    expect(await claimOf(), 'the second instance processed the batch the first held').toBe(newestOf(ROUNDS - 1).getTime())
    await lock`rollback`
    lock.release()
    await first
    expect(await claimOf()).toBe(newestOf(ROUNDS).getTime())
    for (let k = 0; k < 5; k++) {
      const [left] = await sql`select count(*)::int as n from tag_analysis_state
        where tag_id in ${sql(tagIds)} and last_sample_time is distinct from ${newestOf(ROUNDS)}`
      if (left!.n === 0) break
      await tickOn(bases[k % 2]!)
    }
    // And each instance alone does the whole of a round, so both are seen working whatever the timing.
    for (const [i, base] of bases.entries()) {
      const before = done.get(base)!.samples
      await ingestAll(samplesOfRound(ROUNDS + 1 + i))
      await tickOn(base)
      expect(done.get(base)!.samples - before, `${base} alone`).toBe(TAGS * SAMPLES_PER_ROUND)
    }
    const total = { samples: 0, evaluations: 0 }
    for (const d of done.values()) { total.samples += d.samples; total.evaluations += d.evaluations }
    // Every stored sample was read by exactly one tick: a tag processed twice would count twice.
    expect(total.samples).toBe(TAGS * (ROUNDS + 3) * SAMPLES_PER_ROUND)
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
  })

  it('a session cookie from one instance opens the other: sessions live in the cookie, not in one process', async () => {
    const cookie = await signInAs('operator')
    expect((await call(`${second.url}/api/units`, { cookie })).status).toBe(200)
  })
})
