import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, tick, waitForDemoSite } from '../support/pipeline'
import { activation, insertOccurrence, insertRule, oneShot } from '../support/reviewFixtures'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(async () => { await sql.end() })

// Alarm histories stated here and grouped by the pipeline's tick; each expectation follows from
// the grouping rule (shared/alarms/incidents.ts: a later alarm joins while the earlier stands or
// within the site's window after it ended) and the lead-time definition (first slowing-down alert
// to first limit alarm).
const MIN = 60_000
const T0 = Date.UTC(2026, 1, 10, 8, 0, 0)
let supervisor = ''
let operator = ''
let engineer = ''
let admin = ''
const ids: Record<string, number> = {}
const incidentOf = async (alarmId: number) => Number((await sql`select incident_id from incident_alarms where alarm_id = ${alarmId}`)[0]?.incident_id ?? 0)
const membersOf = async (incidentId: number) => (await sql`select alarm_id from incident_alarms where incident_id = ${incidentId} order by alarm_id`).map(r => Number(r.alarm_id))

beforeAll(async () => {
  await waitForDemoSite(sql)
  ;[supervisor, operator, engineer, admin] = await Promise.all(['supervisor', 'operator', 'engineer', 'admin'].map(r => signInAs(r as 'operator')))
  const alert = () => insertRule(sql, { unitCode: 'T-400', alarmClass: 'alert', measure: 'early_warning' })
  const limit = (unitCode = 'T-400') => insertRule(sql, { unitCode, priority: 'high' })
  // Default window 30 min: the slowing-down alert at 0, its limit alarm 20 min later (joins), then
  // an alarm 95 min in (65 min after the last one ended: apart), and one on another unit.
  ids.warn = await oneShot(sql, await alert(), T0)
  ids.limit = await oneShot(sql, await limit(), T0 + 20 * MIN)
  ids.later = await oneShot(sql, await limit(), T0 + 95 * MIN)
  ids.other = await oneShot(sql, await limit('D-200'), T0 + 21 * MIN)
  // A slowing-down alert on a third unit that no limit alarm followed.
  ids.lone = await oneShot(sql, await insertRule(sql, { unitCode: 'B-300', alarmClass: 'alert', measure: 'early_warning' }), T0 + 30 * MIN)
  await tick()
})

describe('incidents grouped per unit by the pipeline', () => {
  it('joins alarms within the window, keeps later ones and other units apart, and records the lead time', async () => {
    const first = await incidentOf(ids.warn!)
    expect(first).toBeGreaterThan(0)
    expect(await membersOf(first)).toEqual([ids.warn, ids.limit].sort((a, b) => a! - b!))
    expect(await incidentOf(ids.later!)).not.toBe(first)
    expect(await incidentOf(ids.other!)).not.toBe(first)
    const detail = await call(`/api/incidents/${first}`, { cookie: operator })
    expect(detail.status).toBe(200)
    expect(detail.body.advisory).toBe(ADVISORY_CAUTION)
    expect(detail.body).toMatchObject({ state: 'open', origin: 'automatic', unitCode: 'T-400', verdict: 'before', leadTimeS: 1200 })
    const list = await call('/api/incidents', { cookie: operator })
    expect(list.status).toBe(200)
    expect(list.body.find((i: { id: number }) => i.id === first)).toMatchObject({ alarmCount: 2, leadTimeS: 1200 })
  })

  it('the window is the site\'s setting: at 10 min an alarm 15 min after the last one ended starts a new incident (audited)', async () => {
    const siteId = Number((await sql`select id from sites limit 1`)[0]!.id)
    expect((await call('/api/review/settings', { method: 'PUT', cookie: engineer, json: { siteId, incidentWindowS: 600 } })).status).toBe(403)
    const bad = await call('/api/review/settings', { method: 'PUT', cookie: supervisor, json: { siteId, incidentWindowS: 10 } })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toContain('incidentWindowS')
    const saved = await call('/api/review/settings', { method: 'PUT', cookie: supervisor, json: { siteId, incidentWindowS: 600 } })
    expect(saved.status).toBe(200)
    expect((await call(`/api/review/settings?siteId=${siteId}`, { cookie: operator })).body.incidentWindowS).toBe(600)
    const [audit] = await sql`select detail from audit_log where action = 'review.settings' order by id desc limit 1`
    expect(audit!.detail).toMatchObject({ before: { incidentWindowS: 1800 }, after: { incidentWindowS: 600 } })
    const a = await oneShot(sql, await insertRule(sql, { unitCode: 'T-400' }), T0 + 300 * MIN)
    const b = await oneShot(sql, await insertRule(sql, { unitCode: 'T-400' }), T0 + 315 * MIN)
    const c = await oneShot(sql, await insertRule(sql, { unitCode: 'T-400' }), T0 + 320 * MIN)
    await tick()
    expect(await incidentOf(b)).not.toBe(await incidentOf(a))
    expect(await incidentOf(c)).toBe(await incidentOf(b))
  })
})

describe('supervisors merge, split, open, review and close; everyone reads', () => {
  it('refuses the other roles on every change (server-checked)', async () => {
    const id = await incidentOf(ids.warn!)
    for (const cookie of [operator, engineer, admin]) {
      expect((await call(`/api/incidents/${id}`, { method: 'PATCH', cookie, json: { cause: 'x' } })).status).toBe(403)
      expect((await call(`/api/incidents/${id}/state`, { method: 'POST', cookie, json: { state: 'under_review' } })).status).toBe(403)
      expect((await call(`/api/incidents/${id}/merge`, { method: 'POST', cookie, json: { incidentId: 1 } })).status).toBe(403)
      expect((await call(`/api/incidents/${id}/split`, { method: 'POST', cookie, json: { alarmIds: [ids.warn] } })).status).toBe(403)
      expect((await call('/api/incidents', { method: 'POST', cookie, json: { unitId: 1, alarmIds: [ids.warn] } })).status).toBe(403)
      expect((await call(`/api/incidents/${id}`, { cookie })).status).toBe(200)
    }
    expect((await call(`/api/incidents/${id}`)).status).toBe(401)
  })

  it('merges an incident of the same unit (the other goes, audited), refuses one of another unit; splits back', async () => {
    const into = await incidentOf(ids.warn!)
    const later = await incidentOf(ids.later!)
    const otherUnit = await incidentOf(ids.other!)
    const cross = await call(`/api/incidents/${into}/merge`, { method: 'POST', cookie: supervisor, json: { incidentId: otherUnit } })
    expect(cross.status).toBe(400)
    expect(cross.body.message).toContain('incidentId')
    const merged = await call(`/api/incidents/${into}/merge`, { method: 'POST', cookie: supervisor, json: { incidentId: later } })
    expect(merged.status).toBe(200)
    expect(await membersOf(into)).toEqual([ids.warn, ids.limit, ids.later].sort((a, b) => a! - b!))
    expect((await call(`/api/incidents/${later}`, { cookie: operator })).status).toBe(404)
    expect((await sql`select 1 from audit_log where action = 'incident.merge' and detail->>'merged' = ${String(later)}`).length).toBe(1)
    const everything = await call(`/api/incidents/${into}/split`, { method: 'POST', cookie: supervisor, json: { alarmIds: [ids.warn, ids.limit, ids.later] } })
    expect(everything.status).toBe(400)
    expect(everything.body.message).toContain('alarmIds')
    const stranger = await call(`/api/incidents/${into}/split`, { method: 'POST', cookie: supervisor, json: { alarmIds: [ids.other] } })
    expect(stranger.status).toBe(400)
    const split = await call(`/api/incidents/${into}/split`, { method: 'POST', cookie: supervisor, json: { alarmIds: [ids.later] } })
    expect(split.status).toBe(201)
    expect(await membersOf(split.body.newId)).toEqual([ids.later])
    expect(await membersOf(into)).toEqual([ids.warn, ids.limit].sort((a, b) => a! - b!))
    // Splitting the limit alarm off leaves the alert with nothing after it: no lead any more.
    const s2 = await call(`/api/incidents/${into}/split`, { method: 'POST', cookie: supervisor, json: { alarmIds: [ids.limit] } })
    expect((await call(`/api/incidents/${into}`, { cookie: operator })).body).toMatchObject({ verdict: 'no_limit_alarm', leadTimeS: null })
    await call(`/api/incidents/${into}/merge`, { method: 'POST', cookie: supervisor, json: { incidentId: s2.body.newId } })
    expect((await call(`/api/incidents/${into}`, { cookie: operator })).body.leadTimeS).toBe(1200)
  })

  it('opens one by hand over alarms of one unit; the emptied automatic incident goes', async () => {
    const d200 = Number((await sql`select id from units where code = 'D-200'`)[0]!.id)
    const was = await incidentOf(ids.other!)
    const wrongUnit = await call('/api/incidents', { method: 'POST', cookie: supervisor, json: { unitId: d200, alarmIds: [ids.later] } })
    expect(wrongUnit.status).toBe(400)
    expect(wrongUnit.body.message).toContain('alarmIds')
    const opened = await call('/api/incidents', { method: 'POST', cookie: supervisor, json: { unitId: d200, alarmIds: [ids.other], title: 'Digester upset' } })
    expect(opened.status).toBe(201)
    expect(await membersOf(opened.body.id)).toEqual([ids.other])
    expect((await call(`/api/incidents/${was}`, { cookie: operator })).status).toBe(404)
    expect((await call(`/api/incidents/${opened.body.id}`, { cookie: operator })).body).toMatchObject({ origin: 'manual', title: 'Digester upset' })
    const holding = await call(`/api/incidents?alarmId=${ids.other}`, { cookie: operator })
    expect(holding.body.map((i: { id: number }) => i.id)).toEqual([opened.body.id])
  })

  it('open → under review → closed with findings and a sign-off by name and time; closed stays closed', async () => {
    const id = await incidentOf(ids.warn!)
    const early = await call(`/api/incidents/${id}/state`, { method: 'POST', cookie: supervisor, json: { state: 'closed' } })
    expect(early.status).toBe(409)
    expect(early.body.message).toContain('state')
    expect((await call(`/api/incidents/${id}/state`, { method: 'POST', cookie: supervisor, json: { state: 'under_review' } })).status).toBe(200)
    const blank = await call(`/api/incidents/${id}/state`, { method: 'POST', cookie: supervisor, json: { state: 'closed' } })
    expect(blank.status).toBe(409)
    expect(blank.body.message).toContain('whatHappened')
    expect((await call(`/api/incidents/${id}`, { method: 'PATCH', cookie: supervisor, json: {} })).body.message).toContain('body')
    const findings = { whatHappened: 'Test vessel approached its high limit.', cause: 'Cooling valve sticking.', actions: 'Valve serviced.', lessons: 'Watch the slowing-down alert.' }
    expect((await call(`/api/incidents/${id}`, { method: 'PATCH', cookie: supervisor, json: findings })).status).toBe(200)
    const closed = await call(`/api/incidents/${id}/state`, { method: 'POST', cookie: supervisor, json: { state: 'closed' } })
    expect(closed.status).toBe(200)
    expect(closed.body).toMatchObject({ state: 'closed', signedOffByName: 'Sam Okafor' })
    expect(Date.parse(closed.body.signedOffAt)).toBeGreaterThan(Date.now() - 5 * MIN)
    expect((await call(`/api/incidents/${id}`, { method: 'PATCH', cookie: supervisor, json: { cause: 'changed' } })).status).toBe(409)
    expect((await call(`/api/incidents/${id}/state`, { method: 'POST', cookie: supervisor, json: { state: 'open' } })).status).toBe(409)
    const audits = await sql`select action, detail from audit_log where target = ${`incident ${id}`} order by id`
    expect(audits.map(a => a.action)).toEqual(expect.arrayContaining(['incident.findings', 'incident.state']))
    expect(audits.find(a => a.action === 'incident.findings')!.detail.after.cause).toBe('Cooling valve sticking.')
  })

  it('marks an unfollowed slowing-down alert averted (audited); one a limit alarm followed, and other alarms, take no mark; bad ids name the field', async () => {
    const marked = await call(`/api/review/alert-outcomes/${ids.lone}`, { method: 'PUT', cookie: supervisor, json: { outcome: 'averted', note: 'operators cut feed' } })
    expect(marked.status).toBe(200)
    expect((await sql`select outcome from alert_outcomes where alarm_id = ${ids.lone!}`)[0]!.outcome).toBe('averted')
    expect((await sql`select count(*)::int as n from audit_log where action = 'alert.outcome' and target = ${`alarm ${ids.lone}`}`)[0]!.n).toBe(1)
    // The alert before the limit alarm is the warning that worked (ISA-18.2 keeps the alarm record as it happened) [common practice].
    const followed = await call(`/api/review/alert-outcomes/${ids.warn}`, { method: 'PUT', cookie: supervisor, json: { outcome: 'false' } })
    expect(followed.status).toBe(409)
    expect(followed.body.message).toContain('followed by a limit alarm')
    expect((await sql`select count(*)::int as n from alert_outcomes where alarm_id = ${ids.warn!}`)[0]!.n).toBe(0)
    expect((await call(`/api/review/alert-outcomes/${ids.limit}`, { method: 'PUT', cookie: supervisor, json: { outcome: 'false' } })).status).toBe(400)
    expect((await call(`/api/review/alert-outcomes/${ids.warn}`, { method: 'PUT', cookie: operator, json: { outcome: 'false' } })).status).toBe(403)
    expect((await call(`/api/review/alert-outcomes/${ids.warn}`, { method: 'PUT', cookie: supervisor, json: { outcome: 'maybe' } })).body.message).toContain('outcome')
    expect((await call('/api/incidents/abc', { cookie: operator })).body.message).toContain('id')
    expect((await call('/api/incidents/987654', { cookie: operator })).status).toBe(404)
  })
})

describe('the incident on one time axis, and its events as CSV', () => {
  it('lists every event in order with who and comment, numbers re-activations, takes in the shift-log notes, and exports them', async () => {
    const operatorId = Number((await sql`select id from users where email = 'operator@harrowgate.example'`)[0]!.id)
    const t = T0 + 2000 * MIN
    const rule = await insertRule(sql, { unitCode: 'T-400', priority: 'medium', name: 'Timeline fixture level' })
    const alarmId = await insertOccurrence(sql, rule, [
      activation(t),
      { at: t + 2 * MIN, event: 'return', from: 'unacknowledged', to: 'rtn_unacknowledged' },
      { at: t + 4 * MIN, event: 'activate', from: 'rtn_unacknowledged', to: 'unacknowledged' },
      { at: t + 5 * MIN, event: 'acknowledge', from: 'unacknowledged', to: 'acknowledged', userId: operatorId, comment: '=seen, level checked' },
      { at: t + 9 * MIN, event: 'return', from: 'acknowledged', to: 'normal' },
    ], t + 9 * MIN)
    const unitId = Number((await sql`select id from units where code = 'T-400'`)[0]!.id)
    await sql`insert into shift_log_notes (site_id, author_id, at, body, unit_id)
      select site_id, ${operatorId}, ${new Date(t + 6 * MIN).toISOString()}::timestamptz, 'Drained the knock-out pot.', id from units where id = ${unitId}`
    await tick()
    const incidentId = await incidentOf(alarmId)
    const res = await call(`/api/incidents/${incidentId}/timeline`, { cookie: operator })
    expect(res.status).toBe(200)
    expect(res.body.advisory).toBe(ADVISORY_CAUTION)
    // Half an hour before the first alarm to a quarter hour after the last event.
    expect(res.body.span).toEqual({ from: new Date(t - 30 * MIN).toISOString(), to: new Date(t + 24 * MIN).toISOString() })
    const rows = res.body.entries.map((e: { event: string, who: string, text: string }) => [e.event, e.who, e.text])
    expect(rows).toEqual([
      ['activate', 'system', ''], ['return', 'system', ''], ['re-activate #2', 'system', ''],
      ['acknowledge', 'Olu Mensah', '=seen, level checked'], ['note', 'Olu Mensah', 'Drained the knock-out pot.'], ['return', 'system', ''],
    ])
    const csv = await fetch(`${(await import('@nuxt/test-utils/e2e')).url(`/api/incidents/${incidentId}/events.csv`)}`, { headers: { cookie: operator } })
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toContain('text/csv')
    const lines = (await csv.text()).trimEnd().split('\r\n')
    expect(lines).toHaveLength(7)
    expect(lines[0]).toContain('plant time (Europe/London)')
    // RFC 4180 quoting of the comma, and the formula guard (OWASP CSV injection) on the leading '='.
    expect(lines[4]).toContain(`"'=seen, level checked"`)
    expect((await call(`/api/incidents/${incidentId}/events.csv`)).status).toBe(401)
  })

  it('charts each tag\'s variance, recovery rate and stored judgement on the axis; any of the unit\'s tags, at most four, bounded', async () => {
    const t = T0 + 4000 * MIN
    const period = 10
    // Unwatched test tags, so the tick writes no indicator points of its own over ours.
    const watchedId = await createTestTag(sql, 'TT-961', 'T-400', period)
    const otherId = await createTestTag(sql, 'TT-962', 'T-400', period)
    await sql`update tags set watched = false where id in (${watchedId}, ${otherId})`
    // A square wave of period 6 samples, ±a about 380: variance a², lag-1 autocorrelation 1 − 4/6 = 1/3
    // (a periodic square wave's autocorrelation is a triangle [from memory]), so the recovery rate
    // −ln(ρ₁)/Δt = ln 3 / 10 s (k = −ln φ/Δ, docs/science.md "Recovery rate").
    const a = 0.5
    await ingestAll(Array.from({ length: 720 }, (_, i) => ({
      tag: 'TT-961', time: new Date(t - 90 * MIN + i * period * 1000).toISOString(), value: 380 + (i % 6 < 3 ? a : -a),
    })))
    // Stored evaluations every 2 min from 40 min before to 20 min after; "slowing down" from −10 to +4 min.
    const evaluations = Array.from({ length: 31 }, (_, k) => {
      const at = t - 40 * MIN + k * 2 * MIN
      const slowing = at >= t - 10 * MIN && at <= t + 4 * MIN
      return { at, evidence: slowing ? 'slowing down' : 'no trend', p: slowing ? 0.01 + k / 1000 : 0.4 + k / 100 }
    })
    for (const e of evaluations)
      await sql`insert into indicator_points (tag_id, time, evidence, p_ar1) values (${watchedId}, ${new Date(e.at).toISOString()}::timestamptz, ${e.evidence}, ${e.p})`
    // 2,500 evaluations a second apart on the other tag, 100 of them "slowing down": more than the route returns.
    const many = Array.from({ length: 2500 }, (_, k) => ({ at: t - 29 * MIN + k * 1000, evidence: k >= 1000 && k < 1100 ? 'slowing down' : 'no trend', p: (k % 97) / 97 }))
    await sql`insert into indicator_points ${sql(many.map(e => ({ tag_id: otherId, time: new Date(e.at), evidence: e.evidence, p_ar1: e.p })))}`
    const alarmId = await oneShot(sql, await insertRule(sql, { unitCode: 'T-400', tagCode: 'TT-961', priority: 'medium', name: 'Timeline fixture square wave' }), t)
    await tick()
    const incidentId = await incidentOf(alarmId)
    const res = await call(`/api/incidents/${incidentId}/timeline`, { cookie: operator })
    expect(res.status).toBe(200)
    const from = t - 30 * MIN
    const to = t + 1000 + 15 * MIN
    expect(res.body.span).toEqual({ from: new Date(from).toISOString(), to: new Date(to).toISOString() })

    // Every tag of the unit is offered, the alarm's tag first; by default only it is charted.
    const unitTags = (await sql`select t.id from tags t join units u on u.id = t.unit_id where u.code = 'T-400'`).map(r => Number(r.id))
    const choices = res.body.tagChoices as { id: number, watchedByAlarm: boolean }[]
    expect(choices.map(c => c.id).sort((x, y) => x - y)).toEqual(unitTags.sort((x, y) => x - y))
    expect(choices[0]).toMatchObject({ id: watchedId, watchedByAlarm: true })
    expect(res.body.series.map((s: { tag: { id: number } }) => s.tag.id)).toEqual([watchedId])

    // Variance and recovery rate over the span, against the square wave's (the local-linear trend
    // takes a little of the variance: within 10 %; the rate within 3 %).
    const series = res.body.series[0] as { time: number[], variance: (number | null)[], recoveryRate: (number | null)[] }
    const inSpan = (values: (number | null)[]) =>
      values.filter((v, i): v is number => v !== null && series.time[i]! * 1000 >= from && series.time[i]! * 1000 <= to)
    const variance = inSpan(series.variance)
    const rate = inSpan(series.recoveryRate)
    expect(variance.length).toBeGreaterThan(100)
    expect(rate.length).toBeGreaterThan(100)
    for (const v of variance) expect(Math.abs(v / (a * a) - 1)).toBeLessThan(0.1)
    for (const k of rate) expect(Math.abs(k / (Math.log(3) / period) - 1)).toBeLessThan(0.03)

    // The judgement strip: exactly the stored evaluations inside the span, in order.
    const strip = res.body.judgement.find((j: { tagId: number }) => j.tagId === watchedId)
    const expected = evaluations.filter(e => e.at >= from && e.at <= to)
    expect(strip.time).toEqual(expected.map(e => e.at / 1000))
    expect(strip.evidence).toEqual(expected.map(e => e.evidence))
    expect(strip.p).toEqual(expected.map(e => e.p))
    expect(strip.thinned).toBe(false)

    // A tag no alarm watches, picked: charted first as asked; its 2,500 evaluations thinned to about
    // a thousand, with the "slowing down" run still starting and ending where it did.
    const picked = await call(`/api/incidents/${incidentId}/timeline?tags=${otherId},${watchedId}`, { cookie: operator })
    expect(picked.status).toBe(200)
    expect(picked.body.series.map((s: { tag: { id: number } }) => s.tag.id)).toEqual([otherId, watchedId])
    const thin = picked.body.judgement.find((j: { tagId: number }) => j.tagId === otherId) as
      { time: number[], evidence: string[], p: number[], thinned: boolean }
    expect(thin.thinned).toBe(true)
    expect(thin.time.length).toBeLessThanOrEqual(1004)
    expect(thin.time.length).toBeGreaterThan(800)
    const slowTimes = thin.time.filter((_, i) => thin.evidence[i] === 'slowing down')
    expect(Math.min(...slowTimes)).toBe(many[1000]!.at / 1000)
    expect(Math.max(...slowTimes)).toBe(many[1099]!.at / 1000)
    const byTime = new Map(many.map(e => [e.at / 1000, e]))
    thin.time.forEach((time, i) => expect([thin.evidence[i], thin.p[i]]).toEqual([byTime.get(time)!.evidence, byTime.get(time)!.p]))

    // Bad picks: 400 naming the field.
    const otherUnitTag = Number((await sql`select t.id from tags t join units u on u.id = t.unit_id where u.code = 'D-200' limit 1`)[0]!.id)
    const fiveTags = unitTags.length >= 5
      ? unitTags.slice(0, 5)
      : [...unitTags, ...Array.from({ length: 5 - unitTags.length }, (_, i) => 900_000 + i)]
    for (const tags of ['abc', fiveTags.join(','), `${watchedId},${watchedId}`, String(otherUnitTag)]) {
      const bad = await call(`/api/incidents/${incidentId}/timeline?tags=${tags}`, { cookie: operator })
      expect(bad.status, tags).toBe(400)
      expect(bad.body.message, tags).toContain('tags')
    }
  })
})
