import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, tick, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'

// Issue 13 item 1: one sample stamped far ahead (9999-12-31, or a year out) moved the tag's claim
// into the future, and no later sample was ever analysed. The tick must not read past now plus
// the skew allowance, and a claim already standing in the future must recover.
await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(() => sql.end())
const TAG = 'TT-950'
let tagId = 0
beforeAll(async () => {
  await waitForDemoSite(sql)
  tagId = await createTestTag(sql, TAG, 'T-400', 1)
})
// Samples one second apart, ending well before now, so every one is inside the horizon.
const T0 = Date.now() - 3_600_000
let next = 0
const feed = (n: number) => ingestAll(Array.from({ length: n }, () => {
  const i = next++
  return { tag: TAG, time: new Date(T0 + 1000 * i).toISOString(), value: 300 + Math.sin(i / 7) + ((i * 7919) % 13) / 13 }
}))
const lastFedMs = () => T0 + 1000 * (next - 1)
const state = async () => {
  const [row] = await sql`select st.last_sample_time, (select max(time) from indicator_points p where p.tag_id = st.tag_id) as last_point,
      ts.latest_time from tag_analysis_state st join tag_status ts on ts.tag_id = st.tag_id where st.tag_id = ${tagId}`
  return {
    claim: row!.last_sample_time as Date | null, lastPoint: row!.last_point as Date | null, statusTime: row!.latest_time as Date | null
  }
}

describe('a future-dated sample never stalls a tag', () => {
  it('a far-future row written straight into the table waits, and later samples are analysed', async () => {
    await feed(400)
    await tick()
    const before = await state()
    expect(before.claim!.getTime()).toBe(lastFedMs())
    expect(before.lastPoint).not.toBeNull()
    // Bypasses ingest (which refuses it): stands for bad rows stored before the check existed.
    await sql`insert into samples (tag_id, time, value, quality) values (${tagId}, '9999-12-31T23:59:59Z', 301, 0)`
    await feed(100)
    await tick()
    const after = await state()
    expect(after.claim!.getTime()).toBe(lastFedMs())
    expect(after.statusTime!.getTime()).toBe(lastFedMs())
    expect(after.lastPoint!.getTime()).toBeGreaterThan(before.lastPoint!.getTime())
  })

  it('a claim already standing in the future (stalled before the fix) restarts and catches up', async () => {
    // The stalled state as the old pipeline left it: claim, a point and the status at the bad sample.
    const [{ point }] = await sql`select max(time) as point from indicator_points where tag_id = ${tagId}`
    await sql`insert into indicator_points (tag_id, time, quality) values (${tagId}, '9999-12-31T23:59:59Z', null)`
    await sql`update tag_analysis_state set last_sample_time = '9999-12-31T23:59:59Z', last_evaluated_time = '9999-12-31T23:59:59Z' where tag_id = ${tagId}`
    await sql`update tag_status set latest_time = '9999-12-31T23:59:59Z' where tag_id = ${tagId}`
    await feed(100)
    await tick()
    const after = await state()
    expect(after.claim!.getTime()).toBe(lastFedMs())
    expect(after.statusTime!.getTime()).toBe(lastFedMs())
    expect(after.lastPoint!.getTime()).toBeGreaterThan((point as Date).getTime())
    expect(after.lastPoint!.getTime()).toBeLessThan(Date.now())
    const [{ n }] = await sql`select count(*)::int as n from indicator_points where tag_id = ${tagId} and time > now() + interval '1 day'`
    expect(n).toBe(0)
  })
})
