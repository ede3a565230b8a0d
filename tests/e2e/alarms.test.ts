import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { testSql } from '../support/db'
import { startTestMailbox, MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, mailboxMessages, tick, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

const { mailbox, smtpUrl } = await startTestMailbox()
await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: smtpUrl })
const sql = testSql()
afterAll(async () => { await sql.end(); await mailbox.close() })
const TAG = 'TT-901'
let tagId = 0
let engineer = ''
let operator = ''
let admin = ''
// setup() starts the server in its own beforeAll, which runs before this one.
beforeAll(async () => {
  await waitForDemoSite(sql)
  tagId = await createTestTag(sql, TAG, 'T-400', 1)
  RULE.tagId = tagId
  ;[engineer, operator, admin] = await Promise.all([signInAs('engineer'), signInAs('operator'), signInAs('admin')])
})
const T0 = Date.now() - 600_000
let nextSecond = 0
/** Samples one second apart, continuing where the last call stopped. */
const feed = (...values: number[]) =>
  ingestAll(values.map(value => ({ tag: TAG, time: new Date(T0 + 1000 * nextSecond++).toISOString(), value })))

const RULE = {
  targetKind: 'tag', tagId: 0, name: 'TT-901 high limit', measure: 'value', comparison: 'above', threshold: 100, deadband: 5,
  onDelayS: 0, offDelayS: 0, priority: 'high', alarmClass: 'alarm',
  consequence: 'Test vessel over-temperature.', likelyCause: 'Heater stuck on.', operatorAction: 'Switch the test heater to manual and close its valve.', timeToRespondS: 600,
}
let ruleId = 0
const alarmOf = async () => (await call(`/api/alarms?view=history&limit=500`, { cookie: operator })).body.alarms.filter((a: { ruleId: number }) => a.ruleId === ruleId)

describe('alarm rules API', () => {
  it('lets an engineer create a rule, audit-logged, and refuses other roles and missing rationale', async () => {
    expect((await call('/api/rules', { method: 'POST', cookie: operator, json: RULE })).status).toBe(403)
    const noAction = await call('/api/rules', { method: 'POST', cookie: engineer, json: { ...RULE, operatorAction: undefined } })
    expect(noAction.status).toBe(400)
    expect(noAction.body.message).toContain('operatorAction')
    const blank = await call('/api/rules', { method: 'POST', cookie: engineer, json: { ...RULE, consequence: '   ' } })
    expect(blank.status).toBe(400)
    expect(blank.body.message).toContain('consequence')
    const created = await call('/api/rules', { method: 'POST', cookie: engineer, json: RULE })
    expect(created.status).toBe(201)
    ruleId = created.body.id
    const [audit] = await sql`select action, detail from audit_log where action = 'alarm_rule.create' and detail->>'id' = ${String(ruleId)}`
    expect(audit).toBeTruthy()
  })
})

describe('live alarm lifecycle (ISA-18.2 state-transition diagram per docs/science.md §S7.2) and mail', () => {
  let alarmId = 0
  it('mails within 2 ticks of the sample that completes the condition (docs/design.md §D11), with the advisory caution (docs/design.md §D1)', async () => {
    await feed(90, 91, 92, 93)
    await tick()
    expect(await alarmOf()).toHaveLength(0)
    await feed(101)
    let mail
    for (let ticks = 1; ticks <= 2 && !mail; ticks++) {
      await tick()
      mail = (await mailboxMessages(mailbox.httpPort)).find(m => m.subject.includes(TAG))
    }
    expect(mail, 'no mail within 2 ticks').toBeTruthy()
    const [alarm] = await alarmOf()
    alarmId = alarm.id
    expect(alarm).toMatchObject({ state: 'unacknowledged', priority: 'high', tagCode: TAG, raisedValue: 101, operatorAction: RULE.operatorAction })
    expect(mail!.to).toContain('oncall@harrowgate.example')
    expect(mail!.subject).toContain('HIGH')
    expect(mail!.text).toContain(ADVISORY_CAUTION)
    expect(mail!.text).toContain(`Operator action: ${RULE.operatorAction}`)
    expect(mail!.text).toContain(`http://brinkline.test:3000/alarms/${alarmId}`)
    expect(mail!.text).toMatch(/Raised: .* at 101 K/)
    expect(mail!.text).toContain('Fold horizon:')
  })

  it('B → C on acknowledgement by an operator; admin may not; a retried request is recognised, a repeat is a 409 naming the alarm and state', async () => {
    expect((await call('/api/alarms/acknowledge', { method: 'POST', cookie: admin, json: { ids: [alarmId] } })).status).toBe(403)
    const ack = await call('/api/alarms/acknowledge', { method: 'POST', cookie: operator, json: { ids: [alarmId], comment: 'seen, heater checked', requestId: 'ack-req-0001' } })
    expect(ack.status).toBe(200)
    expect(ack.body.alarms[0].state).toBe('acknowledged')
    const retry = await call('/api/alarms/acknowledge', { method: 'POST', cookie: operator, json: { ids: [alarmId], requestId: 'ack-req-0001' } })
    expect(retry.status).toBe(200)
    expect(retry.body.replayed).toBe(true)
    // The same requestId from another user, or for other alarms, is not a retry: 409, nothing replayed.
    const supervisor = await signInAs('supervisor')
    const otherUser = await call('/api/alarms/acknowledge', { method: 'POST', cookie: supervisor, json: { ids: [alarmId], requestId: 'ack-req-0001' } })
    expect(otherUser.status).toBe(409)
    expect(otherUser.body.message).toContain('requestId:')
    const otherAlarms = await call('/api/alarms/acknowledge', { method: 'POST', cookie: operator, json: { ids: [alarmId, 987654], requestId: 'ack-req-0001' } })
    expect(otherAlarms.status).toBe(409)
    expect(otherAlarms.body.message).toContain('requestId:')
    const again = await call('/api/alarms/acknowledge', { method: 'POST', cookie: operator, json: { ids: [alarmId] } })
    expect(again.status).toBe(409)
    expect(again.body.message).toContain(`alarm ${alarmId}`)
    expect(again.body.message).toContain('is acknowledged')
    expect((await call('/api/alarms/acknowledge', { method: 'POST', cookie: operator, json: { ids: [987654] } })).status).toBe(404)
    expect((await call('/api/alarms/acknowledge', { method: 'POST', cookie: operator, json: { ids: [] } })).body.message).toContain('ids')
  })

  it('C → A only once the value is beyond the deadband (docs/science.md §S7.3: clear when x < H − DB)', async () => {
    await feed(97, 96)
    await tick()
    expect((await alarmOf())[0].state).toBe('acknowledged')
    await feed(94)
    await tick()
    const detail = await call(`/api/alarms/${alarmId}`, { cookie: operator })
    expect(detail.body.state).toBe('normal')
    expect(detail.body.events.map((e: { event: string, actor: string }) => [e.event, e.actor.split(':')[0]]))
      .toEqual([['activate', 'system'], ['acknowledge', 'user'], ['return', 'system']])
    expect(detail.body.events[1].comment).toBe('seen, heater checked')
    const active = await call('/api/alarms?view=active', { cookie: operator })
    expect(active.body.alarms.some((a: { id: number }) => a.id === alarmId)).toBe(false)
  })

  it('shelving is bounded, time-limited, and ends by itself: the still-active alarm is annunciated again (F → resume)', async () => {
    await feed(105)
    await tick()
    const open = (await alarmOf()).find((a: { state: string }) => a.state === 'unacknowledged')
    expect(open).toBeTruthy()
    const tooLong = await call(`/api/alarms/${open.id}/shelve`, { method: 'POST', cookie: operator, json: { reason: 'instrument check', minutes: 721 } })
    expect(tooLong.status).toBe(400)
    expect(tooLong.body.message).toContain('minutes')
    // The body says what went wrong, not "Server Error" (issue 12 item 5): RFC 9110 §15.5.1 names 400 "Bad Request".
    expect(tooLong.body.statusMessage).toBe('Bad Request')
    expect(JSON.stringify(tooLong.body)).not.toContain('Server Error')
    expect((await call(`/api/alarms/${open.id}/shelve`, { method: 'POST', cookie: operator, json: { minutes: 5 } })).body.message).toContain('reason')
    const shelved = await call(`/api/alarms/${open.id}/shelve`, { method: 'POST', cookie: operator, json: { reason: 'instrument check', minutes: 1 } })
    expect(shelved.status).toBe(200)
    expect(shelved.body.state).toBe('shelved')
    expect(new Date(shelved.body.shelvedUntil).getTime() - Date.now()).toBeGreaterThan(50_000)
    // The minute passing, without waiting for it: the expiry moves to the past.
    await sql`update alarms set shelved_until = now() - interval '1 second' where id = ${open.id}`
    await tick()
    const detail = await call(`/api/alarms/${open.id}`, { cookie: operator })
    expect(detail.body.state).toBe('unacknowledged')
    expect(detail.body.events.at(-1)).toMatchObject({ event: 'unshelve', actor: 'system', comment: 'shelve expired' })
    const notShelved = await call(`/api/alarms/${open.id}/unshelve`, { method: 'POST', cookie: operator })
    expect(notShelved.status).toBe(409)
  })

  it('moves the open alarm out of service and back when the engineer changes the rule (H from any state, resume on exit)', async () => {
    const out = await call(`/api/rules/${ruleId}`, { method: 'PATCH', cookie: engineer, json: { mode: 'out_of_service' } })
    expect(out.status).toBe(200)
    const [alarm] = (await alarmOf()).filter((a: { state: string }) => a.state !== 'normal')
    expect(alarm.state).toBe('out_of_service')
    await call(`/api/rules/${ruleId}`, { method: 'PATCH', cookie: engineer, json: { mode: 'in_service' } })
    expect((await call(`/api/alarms/${alarm.id}`, { cookie: operator })).body.state).toBe('unacknowledged')
    const bad = await call(`/api/rules/${ruleId}`, { method: 'PATCH', cookie: engineer, json: { priority: 'critical' } })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toContain('priority')
  })

  it('keeps the tag status current for the overview', async () => {
    const [status] = await sql`select status, latest_value, unacked_alarms from tag_status where tag_id = ${tagId}`
    expect(status).toMatchObject({ latest_value: 105, unacked_alarms: 1 })
  })

  // ISA-18.2 (docs/science.md §S7.2): D → B when the condition returns before acknowledgement;
  // the occurrence stays open, and what the operator reads must be the new activation.
  it('re-raises an unacknowledged alarm that returned: latest activation time, value, count and context, in the list and the mail', async () => {
    const [open] = (await alarmOf()).filter((a: { state: string }) => a.state !== 'normal')
    await feed(94)
    await tick()
    expect((await call(`/api/alarms/${open.id}`, { cookie: operator })).body.state).toBe('rtn_unacknowledged')
    const againAt = T0 + 1000 * nextSecond
    await feed(108)
    await tick()
    const detail = (await call(`/api/alarms/${open.id}`, { cookie: operator })).body
    expect(detail).toMatchObject({ state: 'unacknowledged', activationCount: 2, activatedValue: 108, raisedValue: 105 })
    expect(new Date(detail.activatedAt).getTime()).toBe(againAt)
    expect(new Date(detail.raisedAt).getTime()).toBeLessThan(againAt)
    const activations = detail.events.filter((e: { event: string }) => e.event === 'activate')
    expect(activations.map((e: { value: number }) => e.value)).toEqual([105, 108])
    expect(activations[1].context).toHaveProperty('fold')
    const active = (await call('/api/alarms?view=active', { cookie: operator })).body.alarms.find((a: { id: number }) => a.id === open.id)
    expect(active).toMatchObject({ activationCount: 2, activatedValue: 108 })
    let mail
    for (let ticks = 1; ticks <= 2 && !mail; ticks++) {
      mail = (await mailboxMessages(mailbox.httpPort)).find(m => m.subject.includes(TAG) && m.text.includes('Raised again'))
      if (!mail) await tick()
    }
    expect(mail, 'no mail for the re-activation').toBeTruthy()
    expect(mail!.text).toMatch(/Raised again: .* at 108 K/)
    expect(mail!.text).toContain('activation 2 of this occurrence, first raised')
  })
})
