import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { testSql } from '../support/db'
import { busToCollapse, FIXED_START_MS, simulateDemoUnit, tagWithDemoRules } from '../support/demoPlant'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// Replays of stored history (issue 14 item 4) through the replay job (pg-boss worker on).
await setupBuiltServer({ ...MANUAL_TICKS_ENV, BRINKLINE_REPLAY_WORKER: '1' })
const sql = testSql()
afterAll(() => sql.end())
let engineer = ''
beforeAll(async () => {
  await waitForDemoSite(sql)
  engineer = await signInAs('engineer')
})

const iso = (ms: number) => new Date(ms).toISOString()

/** Asks for a replay; answers its id. */
async function askReplay(body: Record<string, unknown>): Promise<number> {
  const created = await call('/api/replays', { method: 'POST', cookie: engineer, json: body })
  expect(created.status, JSON.stringify(created.body)).toBe(201)
  expect(created.body.advisory).toBe(ADVISORY_CAUTION)
  return created.body.id as number
}

/** Waits for a replay's job to finish, checking the progress it reports on the way. */
async function waitForReplay(id: number) {
  let last = -1
  // No time limit of its own: the job takes as long as the machine needs, the test's timeout bounds it.
  for (;;) {
    const res = await call(`/api/replays/${id}`, { cookie: engineer })
    expect(res.status).toBe(200)
    expect(res.body.progress).toBeGreaterThanOrEqual(last)
    last = res.body.progress
    if (res.body.state === 'done' || res.body.state === 'failed') return res.body
    await new Promise(resolve => setTimeout(resolve, 500))
  }
}

const replayToEnd = async (body: Record<string, unknown>) => waitForReplay(await askReplay(body))

type Firing = { ruleId: number, time: number, change: string }
const byTime = (a: { ruleId: number, ms: number }, b: { ruleId: number, ms: number }) => a.ms - b.ms || a.ruleId - b.ruleId
const activations = (firings: Firing[]) => firings.filter(f => f.change === 'activate').map(f => ({ ruleId: f.ruleId, ms: Math.round(f.time * 1000) }))

describe('replay of stored history', () => {
  // The demo load bus driven to voltage collapse (docs/science.md §S10.2), stored and processed by
  // the live pipeline in two ticks; the replay then runs the same history in its own steps. The
  // outside reference for "the same alarms at the same times" is what the live pipeline stored.
  it('gives the live pipeline\'s alarms at the same times and warns before the marked collapse', async () => {
    await sql`insert into units (site_id, code, name, kind) select site_id, 'B-381', 'Replay load bus', kind from units where code = 'B-300'`
    const voltage = await tagWithDemoRules(sql, engineer, 'EI-381', 'B-381', 2, 'EI-301')
    const { samples, tipMs } = busToCollapse()
    expect(tipMs, 'the simulated bus never tipped').not.toBeNull()
    const shift = FIXED_START_MS - tipMs!
    const rows = samples.filter(s => s.tag === 'EI-301' && s.time <= tipMs!).map(s => ({ tag: 'EI-381', time: iso(s.time + shift), value: s.value }))
    const half = Math.floor(rows.length / 2)
    await ingestAll(rows.slice(0, half))
    await runServerTask('indicators:refresh')
    await ingestAll(rows.slice(half))
    await runServerTask('indicators:refresh')
    const live = await sql`select a.rule_id, e.condition_time from alarm_events e join alarms a on a.id = e.alarm_id
      where a.tag_id = ${voltage} and e.event = 'activate' order by e.condition_time, a.rule_id`
    expect(live.length, 'the live pipeline raised nothing on the approach').toBeGreaterThan(0)
    const [before] = await sql`select count(*)::int as n from alarm_events`

    const report = await replayToEnd({
      tagId: voltage, from: rows[0]!.time, to: iso(FIXED_START_MS), eventTime: iso(FIXED_START_MS), warningWindowMinutes: 120,
    })
    expect(report.state, report.error).toBe('done')
    expect(report.progress).toBe(1)
    expect(report.result.samples).toBe(rows.length)
    const replayed = activations(report.result.firings)
    const stored = live.map(r => ({ ruleId: Number(r.rule_id), ms: new Date(r.condition_time).getTime() }))
    expect(replayed.sort(byTime)).toEqual(stored.sort(byTime))
    // The replay's alarms are only its report: nothing was added to the live alarm history.
    const [after] = await sql`select count(*)::int as n from alarm_events`
    expect(after!.n).toBe(before!.n)

    const warningRule = (report.rules as { id: number, name: string }[]).find(r => r.name.includes('slowing down'))!
    const outcome = (report.result.rules as { ruleId: number, leadTimeS: number | null }[]).find(r => r.ruleId === warningRule.id)!
    const [firstAlert] = await sql`select min(e.condition_time) as t from alarm_events e join alarms a on a.id = e.alarm_id
      where a.rule_id = ${warningRule.id} and e.event = 'activate'`
    expect(outcome.leadTimeS, 'no slowing-down alert before the collapse').not.toBeNull()
    expect(outcome.leadTimeS! * 1000).toBeCloseTo(FIXED_START_MS - new Date(firstAlert!.t).getTime(), 0)
    console.log(`replay: slowing-down alert ${(outcome.leadTimeS! / 60).toFixed(1)} min before the marked collapse; earliest warning of any rule ${(report.result.leadTimeS / 60).toFixed(1)} min`)
    expect(outcome.leadTimeS!).toBeGreaterThan(120)
    expect(report.result.chart.pointTime.length).toBe(report.result.evaluations)
    const [audit] = await sql`select detail from audit_log where action = 'replay.create' and detail->>'id' = ${String(report.id)}`
    expect(audit, 'the replay was not audited').toBeTruthy()
  }, 600_000)

  // A settings version saved between two ticks governs what the live task evaluated after it, though
  // the samples it evaluated are timed before the save (back-filled history). The replay takes each
  // version over the samples it governed, read from the points it produced, so it gives the live
  // evaluations at the same times and the same alarms. The outside reference is what the live
  // pipeline stored.
  it('runs each settings version over the history it governed live', async () => {
    await sql`insert into units (site_id, code, name, kind) select site_id, 'B-382', 'Replay load bus, re-tuned', kind from units where code = 'B-300'`
    const voltage = await tagWithDemoRules(sql, engineer, 'EI-382', 'B-382', 2, 'EI-301')
    const { samples, tipMs } = busToCollapse()
    const shift = FIXED_START_MS - tipMs!
    const rows = samples.filter(s => s.tag === 'EI-301' && s.time <= tipMs!).map(s => ({ tag: 'EI-382', time: iso(s.time + shift), value: s.value }))
    const half = Math.floor(rows.length / 2)
    await ingestAll(rows.slice(0, half))
    await runServerTask('indicators:refresh')
    const first = (await call(`/api/tags/${voltage}/indicator-settings`, { cookie: engineer })).body.current
    const saved = await call(`/api/tags/${voltage}/indicator-settings`, {
      method: 'PUT', cookie: engineer, json: { settings: { ...first, evaluateEvery: 30 }, reason: 'fewer evaluations' },
    })
    expect(saved.status, JSON.stringify(saved.body)).toBe(200)
    await ingestAll(rows.slice(half))
    await runServerTask('indicators:refresh')
    const livePoints = await sql`select extract(epoch from time)::float8 as t, settings_version_id as v from indicator_points
      where tag_id = ${voltage} order by time`
    expect(new Set(livePoints.map(p => p.v)).size, 'the live task did not use both versions').toBe(2)
    const live = await sql`select a.rule_id, e.condition_time from alarm_events e join alarms a on a.id = e.alarm_id
      where a.tag_id = ${voltage} and e.event = 'activate' order by e.condition_time, a.rule_id`

    const report = await replayToEnd({ tagId: voltage, from: rows[0]!.time, to: iso(FIXED_START_MS) })
    expect(report.state, report.error).toBe('done')
    expect(report.settingsInForce.map((e: { versionId: number }) => e.versionId)).toEqual([...new Set(livePoints.map(p => p.v))])
    expect(report.result.evaluations).toBe(livePoints.length)
    expect(report.result.chart.pointTime.map((t: number) => Math.round(t * 1000))).toEqual(livePoints.map(p => Math.round(p.t * 1000)))
    const stored = live.map(r => ({ ruleId: Number(r.rule_id), ms: new Date(r.condition_time).getTime() }))
    expect(activations(report.result.firings).sort(byTime)).toEqual(stored.sort(byTime))

    // Replayed with the first version throughout instead, the second half has the first one's spacing.
    const alternative = await replayToEnd({ tagId: voltage, from: rows[0]!.time, to: iso(FIXED_START_MS), settings: first })
    expect(alternative.state, alternative.error).toBe('done')
    expect(alternative.settingsInForce).toBeNull()
    expect(alternative.result.evaluations).toBeGreaterThan(livePoints.length)
  }, 600_000)

  // A historian file instead of stored history: the same bus collapse as a CSV for a tag with no
  // samples. It must give what the stored-history replay of the same readings gave (the first test's
  // outside reference is the live pipeline), keep the plant's history untouched, and refuse, line
  // by line, a reading of another tag and a second, different reading at a time already given.
  it('replays a historian file without storing it, as it replays the same stored history', async () => {
    await sql`insert into units (site_id, code, name, kind) select site_id, 'B-383', 'Replay load bus, from a file', kind from units where code = 'B-300'`
    const fileTag = await tagWithDemoRules(sql, engineer, 'EI-383', 'B-383', 2, 'EI-301')
    const historyTag = await tagWithDemoRules(sql, engineer, 'EI-384', 'B-383', 2, 'EI-301')
    const { samples, tipMs } = busToCollapse()
    const shift = FIXED_START_MS - tipMs!
    const readings = samples.filter(s => s.tag === 'EI-301' && s.time <= tipMs!).map(s => ({ time: iso(s.time + shift), value: s.value }))
    await ingestAll(readings.map(r => ({ tag: 'EI-384', ...r })))
    const lines = readings.map(r => `${r.time},EI-383,${r.value}`)
    lines.splice(10, 0, `${readings[5]!.time},EI-383,${readings[5]!.value + 1}`, `${readings[5]!.time},EI-301,${readings[5]!.value}`)
    const csv = ['time,tag,value', ...lines].join('\n')
    const query = new URLSearchParams({
      tagId: String(fileTag), format: 'long', timeColumn: 'time', tagColumn: 'tag', valueColumn: 'value', eventTime: iso(FIXED_START_MS),
    })
    const created = await call(`/api/replays/upload?${query}`, { method: 'POST', cookie: engineer, headers: { 'content-type': 'text/csv' }, body: csv })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    expect(created.body.advisory).toBe(ADVISORY_CAUTION)
    expect(created.body.file).toMatchObject({ rowsRead: readings.length + 2, readings: readings.length, rejectedCount: 2 })
    expect(created.body.file.rejections.map((r: { line: number, column: string }) => [r.line, r.column])).toEqual([[12, 'value'], [13, 'tag']])
    const fromFile = await waitForReplay(created.body.id)
    const fromHistory = await replayToEnd({
      tagId: historyTag, from: readings[0]!.time, to: iso(FIXED_START_MS), eventTime: iso(FIXED_START_MS)
    })
    expect([fromFile.state, fromHistory.state], fromFile.error ?? fromHistory.error).toEqual(['done', 'done'])
    expect(fromFile.source).toBe('upload')
    expect(fromFile.result.samples).toBe(readings.length)
    const ruleName = (report: { rules: { id: number, name: string }[] }, id: number) => report.rules.find(r => r.id === id)!.name.replace(/ \(EI-38\d\)$/, '')
    const named = (report: { rules: { id: number, name: string }[], result: { firings: Firing[] } }) =>
      report.result.firings.map(f => ({ rule: ruleName(report, f.ruleId), time: f.time, change: f.change }))
    expect(named(fromFile)).toEqual(named(fromHistory))
    expect(fromFile.result.leadTimeS).toBe(fromHistory.result.leadTimeS)
    expect(fromFile.result.leadTimeS).toBeGreaterThan(0)
    const [stored] = await sql`select count(*)::int as n from samples where tag_id = ${fileTag}`
    expect(stored!.n, 'a replay file reached the plant history').toBe(0)
    const [kept] = await sql`select count(*)::int as n from replay_samples where replay_id = ${created.body.id}`
    expect(kept!.n).toBe(readings.length)

    // The same file again under other settings, as the report's "same file, other settings" asks.
    const settings = (await call(`/api/tags/${fileTag}/indicator-settings`, { cookie: engineer })).body.current
    const again = await replayToEnd({
      tagId: fileTag, from: readings[0]!.time, to: iso(FIXED_START_MS), fileOf: created.body.id,
      settings: { ...settings, evaluateEvery: 40 },
    })
    expect(again.state, again.error).toBe('done')
    expect(again.source).toBe('upload')
    expect(again.result.samples).toBe(readings.length)
    expect(again.result.evaluations).toBe(Math.floor(readings.length / 40))
    const noFile = await call('/api/replays', { method: 'POST', cookie: engineer, json: { tagId: fileTag, from: readings[0]!.time, to: iso(FIXED_START_MS), fileOf: fromHistory.id } })
    expect(noFile.status).toBe(400)
    expect(noFile.body.message).toContain('fileOf')

    const bad: [string, string][] = [
      [`tagId=${fileTag}&format=long&timeColumn=time&tagColumn=tag`, 'valueColumn'],
      [`tagId=${fileTag}&format=long&timeColumn=when&tagColumn=tag&valueColumn=value`, 'timeColumn'],
      [`tagId=999999&format=long&timeColumn=time&tagColumn=tag&valueColumn=value`, 'tagId'],
      [`${query}&warningWindowMinutes=abc`, 'warningWindowMinutes'],
      [`tagId=${fileTag}&format=long&timeColumn=time&tagColumn=tag&valueColumn=value&eventTime=${encodeURIComponent('2020-01-01T00:00:00Z')}`, 'eventTime'],
    ]
    for (const [q, field] of bad) {
      const res = await call(`/api/replays/upload?${q}`, { method: 'POST', cookie: engineer, headers: { 'content-type': 'text/csv' }, body: csv })
      expect(res.status, q).toBe(400)
      expect(res.body.message, q).toContain(field)
    }
    const oneLine = await call(`/api/replays/upload?${query}`, { method: 'POST', cookie: engineer, headers: { 'content-type': 'text/csv' }, body: `time,tag,value\n${lines[0]}` })
    expect(oneLine.status).toBe(400)
    expect(oneLine.body.message).toContain('body')
    const [replays] = await sql`select count(*)::int as n from replays where tag_id = ${fileTag}`
    expect(replays!.n, 'a refused file left a replay behind').toBe(2)
  }, 600_000)

  // The steady feed tank (two OU loops, docs/science.md §S2.3): its stability never changes. The
  // calibrated rate is 0.02 false slowing-down alerts per tag-day (docs/science.md §S8.3), so two
  // days expect 0.04 and the fixed seed's record raises none; its limit rules sit far from the loop's values.
  it('raises nothing over a steady history and reports no false alarms per day', async () => {
    const tag = await tagWithDemoRules(sql, engineer, 'TI-481', 'T-400', 60, 'TI-401')
    const { sampler } = simulateDemoUnit('steady', 60, 7)
    const rows = sampler.samplesUntil(2 * 86_400_000).filter(s => s.tag === 'TI-401')
      .map(s => ({ tag: 'TI-481', time: iso(FIXED_START_MS + Date.parse(s.time)), value: s.value }))
    await ingestAll(rows)
    const report = await replayToEnd({ tagId: tag, from: rows[0]!.time, to: rows.at(-1)!.time })
    expect(report.state, report.error).toBe('done')
    expect(report.result.samples).toBe(rows.length)
    expect(report.result.evaluations).toBeGreaterThan(0)
    expect(report.result.firings).toEqual([])
    expect(report.result.falseAlarmsPerDay).toBe(0)
    expect(report.result.leadTimeS).toBeNull()
    const list = await call('/api/replays', { cookie: engineer })
    expect(list.body.replays.map((r: { id: number }) => r.id)).toContain(report.id)

    // Two more queued at once, one with other settings: both wait their turn and finish, and the
    // other settings are the replay's own. An evaluation falls on every evaluateEvery-th sample
    // counted from the tag's first (evaluateRecord.ts), so 20 and 40 give ⌊n/20⌋ and ⌊n/40⌋.
    const settings = (await call(`/api/tags/${tag}/indicator-settings`, { cookie: engineer })).body.current
    const range = { tagId: tag, from: rows[0]!.time, to: rows.at(-1)!.time }
    const ids = [await askReplay(range), await askReplay({ ...range, settings: { ...settings, evaluateEvery: 40 } })]
    const [own, other] = [await waitForReplay(ids[0]!), await waitForReplay(ids[1]!)]
    expect([own.state, other.state]).toEqual(['done', 'done'])
    expect([own.alternativeSettings, other.alternativeSettings]).toEqual([false, true])
    expect(settings.evaluateEvery).toBe(20)
    expect(own.result.evaluations).toBe(Math.floor(rows.length / 20))
    expect(other.result.evaluations).toBe(Math.floor(rows.length / 40))
    expect((await call(`/api/tags/${tag}/indicator-settings`, { cookie: engineer })).body.current.evaluateEvery).toBe(20)
  }, 600_000)

  // A unit's slow-mode rules over the fits the live task recorded: two tags of a load bus driven to
  // collapse, processed in six ticks (one slow-mode fit per tick at most). One rule holds on every
  // fit, one never; the replay must give the live unit alarms at the same times. The outside
  // reference is what the live pipeline stored.
  it('replays a unit\'s slow-mode rules over the recorded fits, as the live task raised them', async () => {
    await sql`insert into units (site_id, code, name, kind) select site_id, 'B-391', 'Replay load bus, unit rules', kind from units where code = 'B-300'`
    const [unit] = await sql`select id from units where code = 'B-391'`
    for (const code of ['EI-391', 'JI-391']) await createTestTag(sql, code, 'B-391', 2)
    const rationale = { consequence: 'c', likelyCause: 'c', operatorAction: 'c', timeToRespondS: 600 }
    const ruleIds: number[] = []
    for (const [name, comparison] of [['B-391 slow mode always', 'below'], ['B-391 slow mode never', 'above']] as const) {
      const res = await call('/api/rules', {
        method: 'POST', cookie: engineer,
        json: { targetKind: 'unit', unitId: unit!.id, name, measure: 'recovery_rate', comparison, threshold: 1e9, priority: 'low', alarmClass: 'alert', ...rationale },
      })
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      ruleIds.push(res.body.id)
    }
    const { samples, tipMs } = busToCollapse()
    const shift = FIXED_START_MS - tipMs!
    const rows = samples.filter(s => s.time <= tipMs!).map(s => ({ tag: s.tag === 'EI-301' ? 'EI-391' : 'JI-391', time: iso(s.time + shift), value: s.value }))
    const chunk = Math.ceil(rows.length / 6)
    for (let i = 0; i < rows.length; i += chunk) {
      await ingestAll(rows.slice(i, i + chunk))
      await runServerTask('indicators:refresh')
    }
    const [fits] = await sql`select count(*)::int as n from unit_slow_mode where unit_id = ${unit!.id}`
    expect(fits!.n, 'the live task recorded no slow-mode fit').toBeGreaterThan(1)
    const live = await sql`select a.rule_id, e.condition_time from alarm_events e join alarms a on a.id = e.alarm_id
      where a.rule_id in ${sql(ruleIds)} and e.event = 'activate' order by e.condition_time`
    expect(live.length).toBe(1)

    const report = await replayToEnd({ unitId: unit!.id, from: rows[0]!.time, to: iso(FIXED_START_MS), eventTime: iso(FIXED_START_MS) })
    expect(report.state, report.error).toBe('done')
    expect(report.targetCode).toBe('B-391')
    expect(report.settings).toBeNull()
    expect(report.result.samples).toBe(fits!.n)
    expect(report.rules.map((r: { id: number }) => r.id)).toEqual(ruleIds)
    expect(activations(report.result.firings))
      .toEqual(live.map(r => ({ ruleId: Number(r.rule_id), ms: new Date(r.condition_time).getTime() })))
    const always = report.result.rules.find((r: { ruleId: number }) => r.ruleId === ruleIds[0])
    expect(always.leadTimeS).toBeCloseTo((FIXED_START_MS - new Date(live[0]!.condition_time).getTime()) / 1000, 3)

    for (const [body, field] of [
      [{ unitId: unit!.id, tagId: 1, from: rows[0]!.time, to: iso(FIXED_START_MS) }, 'tagId'],
      [{ from: rows[0]!.time, to: iso(FIXED_START_MS) }, 'tagId'],
      [{ unitId: unit!.id, from: rows[0]!.time, to: iso(FIXED_START_MS), settings: report.settings ?? {} }, 'settings'],
      [{ unitId: 999_999, from: rows[0]!.time, to: iso(FIXED_START_MS) }, 'unitId'],
    ] as const) {
      const res = await call('/api/replays', { method: 'POST', cookie: engineer, json: body })
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.message, JSON.stringify(body)).toContain(field)
    }
  }, 600_000)

  // A replay whose job the queue has given up (its retries spent in a long database outage, or the
  // job cancelled) would otherwise show "running" for ever; the sweep marks it failed and leaves
  // alone one whose job is still live. Job states are pg-boss's own (pg-boss 10 README, "Job states").
  it('marks failed a replay whose job the queue gave up, and only that one', async () => {
    const [tag] = await sql`select id, site_id from tags where code = 'EI-381'`
    const insertRunning = (jobId: string) => sql`insert into replays (site_id, tag_id, from_time, to_time, warning_window_s, settings, rules, state, job_id)
      select ${tag!.site_id}, ${tag!.id}, '2026-01-01T00:00:00Z', '2026-01-01T01:00:00Z', 7200, r.settings, '[]'::jsonb, 'running', ${jobId}
      from replays r where r.tag_id = ${tag!.id} limit 1 returning id`
    const [gone] = await insertRunning('8d0cba2e-5d0f-4a53-9a57-1d7e0a6f2c11')
    // A finished job (this one completed) is never run again either.
    const [live] = await sql`select id, job_id from replays where job_id is not null and state = 'done' limit 1`
    const [failedJob] = await insertRunning(live!.job_id)
    await runServerTask('replays:sweep')
    const rows = await sql`select id, state, error from replays where id in (${gone!.id}, ${failedJob!.id}) order by id`
    expect(rows.map(r => r.state)).toEqual(['failed', 'failed'])
    expect(rows[0]!.error).toContain('gave this replay up')
    const [done] = await sql`select state from replays where id = ${live!.id}`
    expect(done!.state).toBe('done')

    // A replay whose job is still waiting is left as it is.
    const waiting = await askReplay({ tagId: tag!.id, from: '2026-01-01T00:00:00Z', to: '2026-01-01T01:00:00Z' })
    await runServerTask('replays:sweep')
    const report = await waitForReplay(waiting)
    expect(report.error ?? '').not.toContain('gave this replay up')
  }, 600_000)

  it('refuses bad requests naming the field, and callers without the engineer role', async () => {
    const [tag] = await sql`select id from tags order by id limit 1`
    const base = { tagId: tag!.id, from: '2026-01-01T00:00:00Z', to: '2026-01-02T00:00:00Z' }
    const bad: [Record<string, unknown>, string][] = [
      [{ ...base, to: '2025-12-31T00:00:00Z' }, 'to'],
      [{ ...base, to: '2026-06-01T00:00:00Z' }, 'to'],
      [{ ...base, from: '2026-01-01T00:00:00' }, 'from'],
      [{ ...base, eventTime: '2026-02-01T00:00:00Z' }, 'eventTime'],
      [{ ...base, warningWindowMinutes: 0 }, 'warningWindowMinutes'],
      [{ ...base, tagId: 2 ** 31 }, 'tagId'],
      [{ ...base, tagId: 999_999 }, 'tagId'],
      [{ ...base, settings: { alpha: 0.01 } }, 'settings.windowSamples'],
      [{ ...base, extra: 1 }, 'body'],
    ]
    for (const [body, field] of bad) {
      const res = await call('/api/replays', { method: 'POST', cookie: engineer, json: body })
      expect(res.status, JSON.stringify(body)).toBe(400)
      expect(res.body.message, JSON.stringify(body)).toContain(field)
    }
    const operator = await signInAs('operator')
    expect((await call('/api/replays', { method: 'POST', cookie: operator, json: base })).status).toBe(403)
    expect((await call('/api/replays', { cookie: operator })).status).toBe(403)
    expect((await call('/api/replays/2147483648', { cookie: engineer })).status).toBe(400)
    expect((await call('/api/replays/999999', { cookie: engineer })).status).toBe(404)
  })
})
