import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { testSql } from '../support/db'
import { startTestMailbox, MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, mailboxMessages, tick, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// docs/design.md §D4 item 5: alarms raised from samples older than NUXT_NOTIFY_MAX_AGE_MINUTES
// (default 30) are recorded in full but mailed only once per site, as a history summary.
const { mailbox, smtpUrl } = await startTestMailbox()
await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: smtpUrl })
const sql = testSql()
afterAll(async () => { await sql.end(); await mailbox.close() })

const TAG = 'TT-905'
let operator = ''
beforeAll(async () => {
  await waitForDemoSite(sql)
  const tagId = await createTestTag(sql, TAG, 'T-400', 1)
  const engineer = await signInAs('engineer')
  operator = await signInAs('operator')
  const res = await call('/api/rules', { method: 'POST', cookie: engineer, json: {
    targetKind: 'tag', tagId, name: 'TT-905 high limit', measure: 'value', comparison: 'above', threshold: 100,
    priority: 'urgent', alarmClass: 'alarm', consequence: 'Test vessel over-temperature.', likelyCause: 'Heater stuck on.',
    operatorAction: 'Switch the test heater off.', timeToRespondS: 600,
  } })
  if (res.status !== 201) throw new Error(`rule create answered ${res.status}`)
})

const alarmsOfTag = () => sql`select a.id, a.state, a.activation_count from alarms a join tags t on t.id = a.tag_id where t.code = ${TAG}`

describe('alarms from old history (docs/design.md §D4 item 5)', () => {
  let alarmId = 0
  it('records a back-filled excursion two hours old in full but mails none of its three activations singly', async () => {
    const start = Date.now() - 2 * 3_600_000
    await ingestAll([90, 101, 90, 102, 90, 103].map((value, i) => ({ tag: TAG, time: new Date(start + i * 1000).toISOString(), value })))
    await tick()
    const [alarm, ...others] = await alarmsOfTag()
    expect(others).toHaveLength(0)
    expect(alarm).toMatchObject({ state: 'unacknowledged', activation_count: 3 })
    alarmId = Number(alarm!.id)
    const singles = await sql`select id from notification_outbox where kind = 'alarm' and alarm_id = ${alarmId}`
    expect(singles).toHaveLength(0)
    const [summary, ...more] = await sql`select alarm_ids, status from notification_outbox where kind = 'history_summary'`
    expect(more).toHaveLength(0)
    expect((summary!.alarm_ids as string[]).map(Number)).toEqual([alarmId, alarmId, alarmId])
    const detail = (await call(`/api/alarms/${alarmId}`, { cookie: operator })).body
    const activations = detail.events.filter((e: { event: string }) => e.event === 'activate')
    expect(activations).toHaveLength(3)
    for (const e of activations) expect(e.comment).toMatch(/^from old history .*no mail of its own/)
    expect((await mailboxMessages(mailbox.httpPort)).filter(m => m.subject.includes(TAG))).toHaveLength(0)
  })

  it('sends one summary naming the alarm once as still standing, with its action, link and the caution', async () => {
    // The collection time passing, without waiting for it.
    await sql`update notification_outbox set next_attempt_at = now() where kind = 'history_summary' and status = 'pending'`
    await tick()
    const mails = (await mailboxMessages(mailbox.httpPort)).filter(m => m.subject.includes('history summary'))
    expect(mails).toHaveLength(1)
    expect(mails[0]!.subject).toContain('1 alarm from old history, 1 still standing')
    expect(mails[0]!.text).toContain('3 alarm activations')
    expect(mails[0]!.text).toContain('Still standing now (1)')
    expect(mails[0]!.text).toContain('Operator action: Switch the test heater off.')
    expect(mails[0]!.text.match(new RegExp(`/alarms/${alarmId}\\b`, 'g'))).toHaveLength(1)
    expect(mails[0]!.text).toContain(ADVISORY_CAUTION)
  })

  it('mails a live re-activation of the same alarm at once, from its own facts', async () => {
    const now = Date.now()
    await ingestAll([90, 106].map((value, i) => ({ tag: TAG, time: new Date(now - 3000 + i * 1000).toISOString(), value })))
    await tick()
    const mail = (await mailboxMessages(mailbox.httpPort)).find(m => m.subject.includes(TAG))
    expect(mail, 'no mail for the live re-activation').toBeTruthy()
    expect(mail!.subject).toContain('URGENT')
    expect(mail!.text).toMatch(/Raised again: .* at 106/)
    expect(mail!.text).toContain('activation 4 of this occurrence')
  })
})
