import { createServer } from 'node:net'
import { startServer, stopServer } from '@nuxt/test-utils/e2e'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testSql } from '../support/db'
import { startTestMailbox, MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, mailboxMessages, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

/** A loopback port nothing listens on: the mail relay is down. */
async function closedPort(): Promise<number> {
  const server = createServer().listen(0, '127.0.0.1')
  await new Promise(resolve => server.once('listening', resolve))
  const { port } = server.address() as { port: number }
  await new Promise(resolve => server.close(resolve))
  return port
}

const { mailbox, smtpUrl } = await startTestMailbox()
await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: `smtp://127.0.0.1:${await closedPort()}` })
const sql = testSql()
afterAll(async () => { await sql.end(); await mailbox.close() })

const TAG = 'TT-902'
let tagId = 0
beforeAll(async () => {
  await waitForDemoSite(sql)
  tagId = await createTestTag(sql, TAG, 'R-100', 1)
  const res = await call('/api/rules', { method: 'POST', cookie: await signInAs('engineer'), json: {
    targetKind: 'tag', tagId, name: 'TT-902 high limit', measure: 'value', comparison: 'above', threshold: 100,
    priority: 'urgent', alarmClass: 'alarm', consequence: 'Test reactor over-temperature.', likelyCause: 'Cooling lost.',
    operatorAction: 'Open the test cooling valve fully.', timeToRespondS: 600,
  } })
  if (res.status !== 201) throw new Error(`rule create answered ${res.status}`)
})

const outboxRow = async () => (await sql`
  select o.id, o.status, o.attempts, o.next_attempt_at from notification_outbox o join alarms a on a.id = o.alarm_id where a.tag_id = ${tagId}`)

describe('notification outbox survives a crash (docs/design.md §D4 items 5–6: written with the state change; retried with backoff)', () => {
  it('records a failed attempt and backs off while the relay is down', async () => {
    const t0 = Date.now() - 60_000
    await ingestAll([90, 101].map((value, i) => ({ tag: TAG, time: new Date(t0 + i * 1000).toISOString(), value })))
    await runServerTask('indicators:refresh')
    const [queued] = await outboxRow()
    expect(queued).toMatchObject({ status: 'pending', attempts: 0 })
    await runServerTask('notifications:send')
    const [after] = await outboxRow()
    expect(after).toMatchObject({ status: 'pending', attempts: 1 })
    expect(new Date(after!.next_attempt_at).getTime()).toBeGreaterThan(Date.now())
    const attempts = await sql`select ok, error from outbox_attempts where outbox_id = ${after!.id}`
    expect(attempts).toHaveLength(1)
    expect(attempts[0]!.ok).toBe(false)
    expect(attempts[0]!.error).toBeTruthy()
  })

  it('is sent once by the scheduled sender after the server is killed and restarted with the relay back', async () => {
    await stopServer()
    // NODE_ENV=production: Nitro runs its cron only outside test mode.
    await startServer({ env: { NUXT_SMTP_URL: smtpUrl, NODE_ENV: 'production', TEST: '', NUXT_SENDER_SCHEDULED: 'true' } })
    const deadline = Date.now() + 40_000
    let mails: Awaited<ReturnType<typeof mailboxMessages>> = []
    while (Date.now() < deadline && mails.length === 0) {
      await new Promise(resolve => setTimeout(resolve, 1000))
      mails = (await mailboxMessages(mailbox.httpPort)).filter(m => m.subject.includes(TAG))
    }
    expect(mails).toHaveLength(1)
    expect(mails[0]!.subject).toContain('URGENT')
    const [sent] = await outboxRow()
    expect(sent).toMatchObject({ status: 'sent', attempts: 2 })
    const attempts = await sql`select ok from outbox_attempts where outbox_id = ${sent!.id} order by id`
    expect(attempts.map(a => a.ok)).toEqual([false, true])
    // A later sender run finds nothing left to send: no second copy.
    await new Promise(resolve => setTimeout(resolve, 6000))
    expect((await mailboxMessages(mailbox.httpPort)).filter(m => m.subject.includes(TAG))).toHaveLength(1)
  })
})
