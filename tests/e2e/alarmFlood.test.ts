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

const TAG = 'TT-903'
const RULES = 12
let siteId = 0
beforeAll(async () => {
  await waitForDemoSite(sql)
  const tagId = await createTestTag(sql, TAG, 'D-200', 1)
  ;[{ site_id: siteId }] = await sql`select site_id from tags where id = ${tagId}` as unknown as [{ site_id: number }]
  const engineer = await signInAs('engineer')
  for (let i = 0; i < RULES; i++) {
    const res = await call('/api/rules', { method: 'POST', cookie: engineer, json: {
      targetKind: 'tag', tagId, name: `TT-903 limit ${i}`, measure: 'value', comparison: 'above', threshold: 100 + i,
      priority: 'high', alarmClass: 'alarm', consequence: 'Test overflow.', likelyCause: 'Test inflow.', operatorAction: `Close test valve ${i}.`, timeToRespondS: 600,
    } })
    if (res.status !== 201) throw new Error(`rule create answered ${res.status}`)
  }
})

// Flood: more than 10 alarms in 10 minutes (ISA-18.2 / EEMUA 191, docs/science.md §S7.4 [R: University of
// Alberta alarm-research page]). Past it, one digest replaces a mail per alarm.
describe('alarm flood', () => {
  it('sends at most 10 single alarm mails per 10 minutes on a site and gathers the rest into one digest', async () => {
    await ingestAll([90, 200].map((value, i) => ({ tag: TAG, time: new Date(Date.now() - 30_000 + i * 1000).toISOString(), value })))
    await tick()
    const raised = await sql`select a.id from alarms a join tags t on t.id = a.tag_id where t.code = ${TAG}`
    expect(raised).toHaveLength(RULES)
    const [singles] = await sql`select count(*)::int as n from notification_outbox where kind = 'alarm' and site_id = ${siteId} and created_at > now() - interval '10 minutes'`
    expect(singles!.n).toBeLessThanOrEqual(10)
    const digests = await sql`select id, alarm_ids from notification_outbox where kind = 'digest' and site_id = ${siteId} and status = 'pending'`
    expect(digests).toHaveLength(1)
    const inDigest = (digests[0]!.alarm_ids as string[]).map(Number)
    const mailedAlone = await sql`select alarm_id from notification_outbox where kind = 'alarm' and alarm_id = any(${raised.map(r => r.id)})`
    expect(inDigest.length + mailedAlone.length).toBe(RULES)
    // The digest's collection time passing, without waiting for it.
    await sql`update notification_outbox set next_attempt_at = now() where id = ${digests[0]!.id}`
    await tick()
    const digest = (await mailboxMessages(mailbox.httpPort)).find(m => m.subject.includes('flood digest'))
    expect(digest).toBeTruthy()
    expect(digest!.subject).toContain(`${inDigest.length} alarms`)
    for (const id of inDigest) expect(digest!.text).toContain(`/alarms/${id}`)
    expect(digest!.text).toContain(ADVISORY_CAUTION)
  })
})
