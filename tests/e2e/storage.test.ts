import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// Issue 13 item 9: samples partitioned by time, a raw window per site with a per-minute archive
// behind it, and the admin's view of size and growth. Partition routing and the key including
// the partition key follow the PostgreSQL 15 manual, §5.11 "Table Partitioning" and CREATE TABLE
// ("a unique constraint on a partitioned table must include all the partition key columns").
await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(() => sql.end())

const TAG = 'TS-960'
const DAY_MS = 86_400_000
const NOW = Date.now()
// Five days back: past a two-day raw window whatever the hour; half an hour back: inside it.
const OLD_MS = Math.floor((NOW - 5 * DAY_MS) / 60_000) * 60_000
const RECENT_MS = Math.floor((NOW - 30 * 60_000) / 60_000) * 60_000
const HISTORIC_MS = Date.UTC(2026, 0, 5, 8, 0, 0)
let tagId = 0
let siteId = 0
let admin = ''

/** The partition a time belongs to, named from its UTC day as the migration names them. */
const dayPartition = (ms: number) => `samples_p${new Date(ms).toISOString().slice(0, 10).replaceAll('-', '')}`

// Three minutes of 1 s samples from `startMs`, values known to the test; every 10th one is bad.
function minutesOf(startMs: number, base: number) {
  return Array.from({ length: 180 }, (_, i) => ({
    tag: TAG, time: new Date(startMs + i * 1000).toISOString(), value: base + ((i * 37) % 11), quality: i % 10 === 9 ? 'bad' : 'good',
  }))
}
const oldBatch = minutesOf(OLD_MS, 300)
const recentBatch = minutesOf(RECENT_MS, 400)
const historicBatch = minutesOf(HISTORIC_MS, 500)

const key = () => process.env.BRINKLINE_SIM_KEY!
const ingest = (samples: unknown[]) => call('/api/ingest', { method: 'POST', headers: { authorization: `Bearer ${key()}` }, json: { samples } })

beforeAll(async () => {
  await waitForDemoSite(sql)
  tagId = await createTestTag(sql, TAG, 'T-400', 1)
  const [tag] = await sql`select site_id from tags where id = ${tagId}`
  siteId = tag!.site_id as number
  admin = await signInAs('admin')
})

let acceptedTotal = 0

describe('time-partitioned samples', () => {
  it('ingest lands each sample in its UTC day partition, and a retried batch stores nothing twice', async () => {
    for (const batch of [oldBatch, recentBatch, historicBatch]) {
      const res = await ingest(batch)
      expect(res.status).toBe(200)
      expect(res.body).toMatchObject({ accepted: 180, rejected: [] })
      acceptedTotal += res.body.accepted
    }
    const rows = await sql`select tableoid::regclass::text as part, count(*)::int as n from samples where tag_id = ${tagId} group by 1 order by 1`
    const expected = [[dayPartition(HISTORIC_MS), 180], [dayPartition(OLD_MS), 180], [dayPartition(RECENT_MS), 180]]
    // The old and recent batches may share a day only if the clock says so; they never do 5 days apart.
    expect(rows.map(r => [r.part, r.n])).toEqual(expected.sort((a, b) => String(a[0]).localeCompare(String(b[0]))))
    const retry = await ingest(recentBatch)
    expect(retry.body).toMatchObject({ accepted: 0, duplicates: 180 })
    const [stored] = await sql`select count(*)::int as n from samples where tag_id = ${tagId}`
    expect(stored!.n).toBe(540)
  })

  // Concurrent batches into a day with no partition yet (as a backfill from several gateways does):
  // each asks for the partition at once, and every one must be stored, none answered 500.
  it('stores concurrent batches that all open the same new day', async () => {
    const tag = await createTestTag(sql, 'TS-961', 'T-400', 1)
    const dayMs = Date.UTC(2026, 0, 20, 6, 0, 0)
    const batches = Array.from({ length: 8 }, (_, b) => Array.from({ length: 50 }, (_, i) => ({
      tag: 'TS-961', time: new Date(dayMs + (b * 50 + i) * 1000).toISOString(), value: 20 + (i % 7),
    })))
    const answers = await Promise.all(batches.map(batch => ingest(batch)))
    expect(answers.map(a => a.status), JSON.stringify(answers.find(a => a.status !== 200)?.body)).toEqual(batches.map(() => 200))
    const rows = await sql`select tableoid::regclass::text as part, count(*)::int as n from samples where tag_id = ${tag} group by 1`
    expect(rows.map(r => [r.part, r.n])).toEqual([[dayPartition(dayMs), 400]])
  })

  it('the storage job makes the days ahead and moves rows the default partition caught into their day', async () => {
    // Straight into the table, as a bulk load would: no partition exists for this day yet.
    const strayMs = Date.UTC(2026, 1, 11, 12, 0, 0)
    await sql`insert into samples (tag_id, time, value, quality) values (${tagId}, ${new Date(strayMs)}, 501, 0)`
    const [before] = await sql`select tableoid::regclass::text as part from samples where tag_id = ${tagId} and time = ${new Date(strayMs)}`
    expect(before!.part).toBe('samples_default')
    await runServerTask('storage:maintain')
    const [after] = await sql`select tableoid::regclass::text as part from samples where tag_id = ${tagId} and time = ${new Date(strayMs)}`
    expect(after!.part).toBe(dayPartition(strayMs))
    for (let d = 0; d <= 3; d++) {
      const [row] = await sql`select to_regclass(${dayPartition(Date.now() + d * DAY_MS)}) is not null as made`
      expect(row!.made).toBe(true)
    }
    await sql`delete from samples where tag_id = ${tagId} and time = ${new Date(strayMs)}`
  })
})

describe('raw window and archive', () => {
  it('refuses a raw window that is not a whole number of days from 1 to 3650, naming the field', async () => {
    for (const body of [{ rawRetentionDays: 0 }, { rawRetentionDays: 1.5 }, { rawRetentionDays: '7' }, { rawRetentionDays: 3651 }, {}, { rawRetentionDays: 7, other: 1 }]) {
      const res = await call(`/api/admin/storage/sites/${siteId}`, { method: 'PATCH', cookie: admin, json: body })
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.message).toMatch(body.rawRetentionDays === 7 ? /other|unrecognized/i : /rawRetentionDays/)
    }
    expect((await call('/api/admin/storage/sites/999999', { method: 'PATCH', cookie: admin, json: { rawRetentionDays: 2 } })).status).toBe(404)
    const [site] = await sql`select raw_retention_days from sites where id = ${siteId}`
    expect(site!.raw_retention_days).toBeNull()
  })

  it('folds raw samples past the window into the per-minute archive, which then draws the trend; nothing acknowledged is lost', async () => {
    const eventsBefore = await sql`select count(*)::int as n from alarm_events`
    const set = await call(`/api/admin/storage/sites/${siteId}`, { method: 'PATCH', cookie: admin, json: { rawRetentionDays: 2 } })
    expect(set.status).toBe(200)
    const [audit] = await sql`select detail from audit_log where action = 'site.retention' order by id desc limit 1`
    expect(audit!.detail).toMatchObject({ id: siteId, before: null, after: 2 })

    await runServerTask('storage:maintain')
    const raw = await sql`select time from samples where tag_id = ${tagId} order by time`
    expect(raw.map(r => (r.time as Date).getTime())).toEqual(recentBatch.map(s => Date.parse(s.time)))

    // Every archived minute, checked against figures the test works out from what it sent.
    const archived = await sql`select minute, value_min, value_mean, value_max, samples, bad_samples from samples_minute where tag_id = ${tagId} order by minute`
    const expected = [...historicBatch, ...oldBatch].reduce((minutes, s) => {
      const minute = Math.floor(Date.parse(s.time) / 60_000) * 60_000
      const m = minutes.get(minute) ?? { good: [] as number[], bad: 0 }
      if (s.quality === 'bad') m.bad++
      else m.good.push(s.value)
      return minutes.set(minute, m)
    }, new Map<number, { good: number[], bad: number }>())
    expect(archived.map(r => (r.minute as Date).getTime())).toEqual([...expected.keys()])
    for (const r of archived) {
      const m = expected.get((r.minute as Date).getTime())!
      expect([r.value_min, r.value_max, r.samples, r.bad_samples]).toEqual([Math.min(...m.good), Math.max(...m.good), m.good.length, m.bad])
      expect(r.value_mean).toBeCloseTo(m.good.reduce((a, b) => a + b, 0) / m.good.length, 9)
    }
    // Acknowledged by ingest = still raw + folded into the archive, bad readings included.
    const [folded] = await sql`select coalesce(sum(samples + bad_samples), 0)::int as n from samples_minute where tag_id = ${tagId}`
    const archivedCount = folded!.n as number
    expect(raw.length + archivedCount).toBe(acceptedTotal)
    const eventsAfter = await sql`select count(*)::int as n from alarm_events`
    expect(eventsAfter[0]!.n).toBe(eventsBefore[0]!.n)

    // A second run changes nothing; a re-sent old batch is refused, not archived twice.
    await runServerTask('storage:maintain')
    const [again] = await sql`select coalesce(sum(samples + bad_samples), 0)::int as n from samples_minute where tag_id = ${tagId}`
    expect(again!.n).toBe(archivedCount)
    const resent = await ingest(oldBatch.slice(0, 3))
    expect(resent.status).toBe(200)
    expect(resent.body.accepted).toBe(0)
    expect(resent.body.rejected.map((r: { field: string }) => r.field)).toEqual(['time', 'time', 'time'])
    expect(resent.body.rejected[0].reason).toMatch(/raw window/)

    // The 7-day trend draws the old minutes from the archive: the value line there is its figures.
    const series = await call(`/api/tags/${tagId}/series?range=7d`, { cookie: admin })
    expect(series.status).toBe(200)
    const oldGood = oldBatch.filter(s => s.quality !== 'bad')
    expect(series.body.archivedSampleCount).toBe(oldGood.length)
    // Old values are 300–310, recent ones 400–410: a bucket under 350 is drawn from the archive.
    const inOld = (series.body.value as (number | null)[]).flatMap((v, i) => (v !== null && v < 350 ? [i] : []))
    expect(inOld.length).toBeGreaterThan(0)
    const lows = inOld.map(i => series.body.valueMin[i] as number)
    const highs = inOld.map(i => series.body.valueMax[i] as number)
    expect(Math.min(...lows)).toBe(Math.min(...oldGood.map(s => s.value)))
    expect(Math.max(...highs)).toBe(Math.max(...oldGood.map(s => s.value)))
    await call(`/api/admin/storage/sites/${siteId}`, { method: 'PATCH', cookie: admin, json: { rawRetentionDays: null } })
  })
})

describe('the admin storage report', () => {
  it('gives sizes, bytes per sample, per-table sizes and a projection from the snapshots, to the admin only', async () => {
    expect((await call('/api/admin/storage', { cookie: await signInAs('engineer') })).status).toBe(403)
    // Two snapshots a day apart, 10 MiB of growth: the projection is size now + 10 MiB a day.
    await sql`delete from storage_snapshots`
    const dayAgo = new Date(Date.now() - DAY_MS)
    await sql`insert into storage_snapshots (taken_at, database_bytes, sample_rows, archive_rows) values
      (${dayAgo}, 100000000, 1000, 10), (now(), ${100000000 + 10 * 1048576}, 2000, 20)`
    const res = await call('/api/admin/storage', { cookie: admin })
    expect(res.status).toBe(200)
    const report = res.body
    expect(report.growth.bytesPerDay).toBeCloseTo(10 * 1048576, -3)
    for (const p of report.growth.projected) expect(p.bytes).toBeCloseTo(report.databaseBytes + p.days * report.growth.bytesPerDay, -1)
    const samples = report.tables.find((t: { name: string }) => t.name === 'samples')
    // Partitions summed under their table: no partition appears on its own.
    expect(report.tables.some((t: { name: string }) => /^samples_p\d/.test(t.name))).toBe(false)
    expect(samples.rows).toBe(report.samples.rows)
    expect(report.samples.rows).toBeGreaterThanOrEqual(180)
    expect(report.samples.bytesPerSample).toBeCloseTo(samples.bytes / samples.rows, 6)
    expect(report.sites.find((s: { id: number }) => s.id === siteId)).toMatchObject({ rawRetentionDays: null })
    // Rows of a small table counted as they are, not as of the last ANALYZE (which autovacuum
    // skips below 50 changed rows: PostgreSQL 15 manual §25.1.6): the two snapshots just written.
    const [{ n }] = await sql<{ n: number }[]>`select count(*)::int as n from storage_snapshots`
    expect(report.tables.find((t: { name: string }) => t.name === 'storage_snapshots')?.rows).toBe(n)
    expect(n).toBeGreaterThanOrEqual(2)
  })
})
