import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { testSql } from '../support/db'
import type { UploadEvent, UploadSummary } from '../../shared/types/upload'

await setupBuiltServer()
const sql = testSql()
afterAll(() => sql.end())

let engineer: string
let siteId: number
beforeAll(async () => {
  // The demo seed runs beside the server's start-up; wait for its users rather than race them.
  for (let attempt = 0; !engineer; attempt++) {
    engineer = await signInAs('engineer').catch((err) => {
      if (attempt >= 40) throw err
      return new Promise<string>(resolve => setTimeout(() => resolve(''), 250))
    })
  }
  siteId = (await call('/api/sites', { cookie: engineer })).body[0].id
})

/** POSTs a CSV body (text or a stream) to the import route and reads the NDJSON answer. */
async function importCsv(body: string | ReadableStream<Uint8Array>, query: Record<string, string>, cookie = engineer) {
  const res = await fetch(url(`/api/uploads/import?${new URLSearchParams({ siteId: String(siteId), ...query })}`), {
    method: 'POST', headers: { cookie, 'content-type': 'text/csv' }, body, duplex: 'half',
  } as RequestInit)
  const text = await res.text()
  if (!res.headers.get('content-type')?.includes('ndjson')) return { status: res.status, body: JSON.parse(text), events: [] as UploadEvent[] }
  const events = text.trim().split('\n').map(l => JSON.parse(l) as UploadEvent)
  const last = events.at(-1)!
  return { status: res.status, body: undefined, events, last, summary: 'summary' in last ? last.summary : undefined as unknown as UploadSummary }
}

const samplesOf = (code: string, from: string, to: string) => sql<{ time: Date, value: number, quality: number }[]>`
  select s.time, s.value, s.quality from samples s join tags t on t.id = s.tag_id
  where t.code = ${code} and s.time >= ${new Date(from)} and s.time <= ${new Date(to)} order by s.time`

const LONG_FORMAT = { format: 'long', timeColumn: 'time', tagColumn: 'tag', valueColumn: 'value', qualityColumn: 'quality' }

describe('POST /api/uploads/import', () => {
  it('stores a long file with plant-local times (Europe/London, BST in June) and counts re-imported rows as duplicates', async () => {
    const csv = [
      'time,tag,value,quality',
      '2025-06-02 10:00:00,TI-401,41.5,good',
      '2025-06-02 10:00:05,TI-401,41.6,',
      '2025-06-02 10:00:00,LI-402,70.25,uncertain',
      '2025-06-02T10:00:10Z,TI-401,41.7,2',
    ].join('\n')
    const first = await importCsv(csv, { ...LONG_FORMAT, timeZone: 'Europe/London' })
    expect(first.status).toBe(200)
    expect(first.last).toMatchObject({ type: 'summary' })
    expect(first.summary).toMatchObject({ rowsRead: 4, stored: 4, duplicates: 0, rejectedCount: 0, tags: { 'TI-401': 3, 'LI-402': 1 } })
    // 10:00 BST is 09:00 UTC (IANA tz database, Rule EU: summer time from the last Sunday of March).
    const rows = await samplesOf('TI-401', '2025-06-02T00:00:00Z', '2025-06-02T23:59:59Z')
    expect(rows.map(r => [r.time.toISOString(), r.value, r.quality])).toEqual([
      ['2025-06-02T09:00:00.000Z', 41.5, 0], ['2025-06-02T09:00:05.000Z', 41.6, 0], ['2025-06-02T10:00:10.000Z', 41.7, 2],
    ])
    expect((await samplesOf('LI-402', '2025-06-02T09:00:00Z', '2025-06-02T09:00:00Z'))[0]).toMatchObject({ value: 70.25, quality: 1 })
    const again = await importCsv(csv, { ...LONG_FORMAT, timeZone: 'Europe/London' })
    expect(again.summary).toMatchObject({ rowsRead: 4, stored: 0, duplicates: 4 })
    const [audit] = await sql`select action, detail from audit_log where action = 'samples.upload' order by id desc limit 1`
    expect(audit!.detail).toMatchObject({ stored: 0, duplicates: 4, format: 'long', timeZone: 'Europe/London' })
  })

  it('stores a wide file (semicolons, a column per tag, blank cells skipped), in the site time zone by default', async () => {
    const csv = 'Timestamp;AI-201;AI-202;FI-203\n2025-01-10 06:00:00;12.5;7.01;\n2025-01-10 06:00:20;12.75;;110\n'
    const res = await importCsv(csv, { format: 'wide', timeColumn: 'Timestamp', delimiter: ';' })
    expect(res.summary).toMatchObject({ rowsRead: 2, stored: 4, blankCells: 2, rejectedCount: 0, tags: { 'AI-201': 2, 'AI-202': 1, 'FI-203': 1 } })
    // Fenwick Works is in Europe/London: GMT (UTC+0) in January.
    const ai201 = await samplesOf('AI-201', '2025-01-10T06:00:00Z', '2025-01-10T06:00:20Z')
    expect(ai201.map(r => [r.time.toISOString(), r.value])).toEqual([['2025-01-10T06:00:00.000Z', 12.5], ['2025-01-10T06:00:20.000Z', 12.75]])
    expect((await samplesOf('FI-203', '2025-01-10T06:00:20Z', '2025-01-10T06:00:20Z'))[0]!.value).toBe(110)
  })

  it('dry run: stores nothing and reports each bad line by number (header = line 1), column and reason', async () => {
    const csv = [
      'time,tag,value,quality', // line 1
      '2025-03-30 00:30:00,EI-301,1.01,', // 2: fine
      '2025-03-30 01:30:00,EI-301,1.02,', // 3: skipped hour (clocks went forward 2025-03-30 01:00 UTC, IANA tz database Rule EU)
      '2025-03-30 02:30:00,NO-SUCH,1,', // 4: unknown tag
      '2025-03-30 02:31:00,EI-301,n/a,', // 5: value
      '',
      '2025-03-30 02:32:00,EI-301', // 7: short row
      '2025-03-30 02:33:00,EI-301,1.03,perfect', // 8: quality
    ].join('\n')
    const res = await importCsv(csv, { ...LONG_FORMAT, timeZone: 'Europe/London', dryRun: '1' })
    expect(res.summary).toMatchObject({ dryRun: true, rowsRead: 6, valid: 1, stored: 0, rejectedCount: 5 })
    expect(res.summary.rejections.map(r => [r.line, r.column])).toEqual([[3, 'time'], [4, 'tag'], [5, 'value'], [7, ''], [8, 'quality']])
    expect(res.summary.rejections[0]!.reason).toMatch(/does not exist in Europe\/London/)
    expect(res.summary.rejections[1]!.reason).toContain('NO-SUCH')
    expect(res.summary.rejections[3]!.reason).toBe('has 2 fields; the header has 4')
    expect(await samplesOf('EI-301', '2025-03-29T00:00:00Z', '2025-03-31T00:00:00Z')).toEqual([])
  })

  it('counts every rejected line by cause, past the listed ones (issue 12 item 9)', async () => {
    // 1,200 values of EI-301 (range 0–1.2 pu) far beyond it, each quoting its own number, and
    // one unknown tag after them: two causes, counted over the whole file.
    const rows = Array.from({ length: 1_200 }, (_, i) => `2025-03-01T00:${String(Math.floor(i / 60)).padStart(2, '0')}:${String(i % 60).padStart(2, '0')}Z,EI-301,${50 + i},`)
    const csv = ['time,tag,value,quality', ...rows, '2025-03-01T01:00:00Z,QX-777,1,'].join('\n')
    const res = await importCsv(csv, { ...LONG_FORMAT, dryRun: '1' })
    expect(res.summary).toMatchObject({ rowsRead: 1_201, valid: 0, rejectedCount: 1_201 })
    expect(res.summary.rejections).toHaveLength(1_000)
    expect(res.summary.causes).toEqual([
      { cause: expect.stringMatching(/^… is beyond the physical bound of this tag/), count: 1_200 },
      { cause: 'unknown tag code "QX-777" at this site', count: 1 },
    ])
  })

  it('answers bad settings with 400 naming the field, before any row is read', async () => {
    const csv = 'time,tag,value\n2025-01-01T00:00:00Z,TI-101,1\n'
    const noColumn = await importCsv(csv, { ...LONG_FORMAT, qualityColumn: 'status' })
    expect(noColumn.status).toBe(400)
    expect(noColumn.body.message).toBe('qualityColumn: no column "status" in the header (it has "time", "tag", "value")')
    const badZone = await importCsv(csv, { ...LONG_FORMAT, timeZone: 'Mars/Olympus' })
    expect(badZone.status).toBe(400)
    expect(badZone.body.message).toContain('timeZone: must be an IANA time-zone name')
    const noValue = await importCsv(csv, { format: 'long', timeColumn: 'time', tagColumn: 'tag' })
    expect(noValue.body.message).toContain('valueColumn: is required for the long format')
    const badSite = await importCsv(csv, { ...LONG_FORMAT, siteId: '99999' })
    expect(badSite.body.message).toBe('siteId: no site with id 99999')
    expect((await importCsv('', LONG_FORMAT)).body.message).toContain('the file is empty')
  })

  it('is for engineers only: 401 signed out, 403 for other roles', async () => {
    const csv = 'time,tag,value\n2025-01-01T00:00:00Z,TI-101,1\n'
    expect((await importCsv(csv, LONG_FORMAT, '')).status).toBe(401)
    for (const role of ['operator', 'supervisor', 'admin'] as const) {
      const res = await importCsv(csv, LONG_FORMAT, await signInAs(role))
      expect(res.status).toBe(403)
      expect(res.body.message).toContain('engineer')
    }
    const asOperator = { method: 'POST', body: csv, headers: { 'content-type': 'text/csv' }, cookie: await signInAs('operator') }
    expect((await call('/api/uploads/preview?siteId=1', asOperator)).status).toBe(403)
  })

  // The import lists the first 1,000 rejected lines; the rejections route reads the file again
  // and gives every one as CSV (RFC 4180 records), storing nothing.
  it('gives every rejected line of a file as CSV, beyond the 1,000 the import lists, and stores nothing', async () => {
    const good = Array.from({ length: 10 }, (_, i) => `2025-03-01T00:0${i}:00Z,TI-401,${40 + i},good`)
    const bad = Array.from({ length: 1_500 }, (_, i) => `2025-03-01T01:00:00Z,TI-401,not-a-number-${i},good`)
    const csv = ['time,tag,value,quality', ...good, ...bad].join('\n')
    const imported = await importCsv(csv, { ...LONG_FORMAT, timeZone: 'UTC' })
    expect(imported.summary).toMatchObject({ stored: 10, rejectedCount: 1_500 })
    expect(imported.summary.rejections).toHaveLength(1_000)
    const [before] = await sql`select count(*)::int as n from samples`
    const res = await fetch(url(`/api/uploads/rejections?${new URLSearchParams({ siteId: String(siteId), ...LONG_FORMAT, timeZone: 'UTC' })}`), {
      method: 'POST', headers: { cookie: engineer, 'content-type': 'text/csv' }, body: csv,
    })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('text/csv')
    const lines = (await res.text()).split('\r\n').filter(Boolean)
    expect(lines[0]).toBe('line,column,value,reason')
    expect(lines).toHaveLength(1 + 1_500)
    // Line numbers count the header as line 1: the bad rows are lines 12 to 1,511.
    expect(lines.slice(1).map(l => Number(l.split(',')[0]))).toEqual(Array.from({ length: 1_500 }, (_, i) => 12 + i))
    expect(lines[1]).toContain('value,not-a-number-0,')
    const [after] = await sql`select count(*)::int as n from samples`
    expect(after!.n).toBe(before!.n)
    const operator = await signInAs('operator')
    const refused = await fetch(url(`/api/uploads/rejections?${new URLSearchParams({ siteId: String(siteId), ...LONG_FORMAT })}`), {
      method: 'POST', headers: { cookie: operator, 'content-type': 'text/csv' }, body: csv,
    })
    expect(refused.status).toBe(403)
  })

  it('a file that breaks mid-way: committed batches stay, the error says how far it got, a re-run is safe', async () => {
    const rows = Array.from({ length: 6_000 }, (_, k) => `${Date.UTC(2025, 4, 1) + k * 1000},JI-302,${50 + (k % 7)}`)
    const broken = `time,tag,value\n${rows.join('\n')}\n${Date.UTC(2025, 4, 2)},JI-302,"51\n${rows.join('\n')}\n`
    const res = await importCsv(broken, { format: 'long', timeColumn: 'time', tagColumn: 'tag', valueColumn: 'value' })
    expect(res.last).toMatchObject({ type: 'error', summary: { batchesCommitted: 1, stored: 5_000 } })
    expect((res.last as { message: string }).message).toMatch(/never closed.*1 batch \(5000 new samples\) committed; importing the file again is safe/)
    const fixed = await importCsv(`time,tag,value\n${rows.join('\n')}\n`, { format: 'long', timeColumn: 'time', tagColumn: 'tag', valueColumn: 'value' })
    expect(fixed.summary).toMatchObject({ stored: 1_000, duplicates: 5_000, rejectedCount: 0 })
  })

  // Speed is the benchmark's business, not this test's: it checks that a file far larger than one
  // batch streams through whole, in order, with a progress line per 50,000 rows.
  it('streams a 300,000-row long file through in batches, with progress lines', async () => {
    const ROWS = 300_000
    const TAGS = ['AI-201', 'AI-202', 'FI-203', 'EI-301']
    const start = Date.UTC(2024, 0, 1)
    let i = 0
    const encoder = new TextEncoder()
    // Generated on demand, 10,000 lines per pull: neither side ever holds the whole file.
    const body = new ReadableStream<Uint8Array>({
      start(controller) { controller.enqueue(encoder.encode('time,tag,value\n')) },
      pull(controller) {
        if (i >= ROWS) return controller.close()
        let chunk = ''
        for (const end = Math.min(ROWS, i + 10_000); i < end; i++)
          // Values 0–0.996: inside every one of these tags' ranges (EI-301 reads 0–1.2 pu).
          chunk += `${start + Math.floor(i / TAGS.length) * 1000},${TAGS[i % TAGS.length]},${(i % 997) / 1000}\n`
        controller.enqueue(encoder.encode(chunk))
      },
    })
    // No time limit asserted: the suite runs on a loaded 2-core machine (throughput is the bench's).
    const res = await importCsv(body, { format: 'long', timeColumn: 'time', tagColumn: 'tag', valueColumn: 'value' })
    expect(res.summary).toMatchObject({ rowsRead: ROWS, stored: ROWS, duplicates: 0, rejectedCount: 0, batchesCommitted: ROWS / 5_000 })
    expect(res.events.filter(e => e.type === 'progress').map(e => (e as { rowsRead: number }).rowsRead))
      .toEqual(Array.from({ length: ROWS / 50_000 }, (_, k) => (k + 1) * 50_000))
    const [row] = await sql`select count(*)::int as n, max(s.time) as last from samples s join tags t on t.id = s.tag_id
      where t.code = 'EI-301' and s.time >= ${new Date(start)} and s.time < ${new Date(start + ROWS * 1000)}`
    expect(row).toMatchObject({ n: ROWS / 4, last: new Date(start + (ROWS / 4 - 1) * 1000) })
  }, 600_000)
})

describe('POST /api/uploads/preview', () => {
  it('detects the delimiter, shows the first 20 rows and guesses a wide layout from tag-code headers', async () => {
    const lines = ['time\tTI-101\tAI-102', ...Array.from({ length: 30 }, (_, k) => `2025-02-01 00:00:${String(k).padStart(2, '0')}\t${400 + k}\t0.5`)]
    const res = await call(`/api/uploads/preview?siteId=${siteId}`, {
      method: 'POST', body: `${lines.join('\n')}\n2025-02-01 00:00:3`, headers: { 'content-type': 'text/csv' }, cookie: engineer,
    })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({
      delimiter: '\t', header: ['time', 'TI-101', 'AI-102'], timeZone: 'Europe/London',
      guess: { format: 'wide', timeColumn: 'time', tagColumns: ['TI-101', 'AI-102'] }, knownTags: ['AI-102', 'TI-101'],
    })
    expect(res.body.rows).toHaveLength(20)
    expect(res.body.rows[0]).toEqual(['2025-02-01 00:00:00', '400', '0.5'])
  })
})
