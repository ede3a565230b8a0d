import { mkdtempSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startLocalMailbox, type RunningLocalMailbox } from '../../scripts/mailbox/localMailbox'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, mailboxMessages, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer, startServerInstance } from '../support/server'
import { call, signInAs } from '../support/session'

// The mail relay down for a while, with the server running throughout: the scheduled sender
// keeps the message queued, retries with growing delays, and delivers exactly one copy once the
// relay answers again (docs/design.md §D4 items 5–6). tests/e2e/outboxRestart.test.ts covers the
// same outage with a server restart in between.

/** A loopback port with nothing listening yet: the relay will start there later. */
async function freePort(): Promise<number> {
  const probe = createServer().listen(0, '127.0.0.1')
  await new Promise(resolve => probe.once('listening', resolve))
  const { port } = probe.address() as { port: number }
  await new Promise(resolve => probe.close(resolve))
  return port
}

const relayPort = await freePort()
let relay: RunningLocalMailbox | undefined
await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(async () => { await relay?.close(); await sql.end() })

const TAG = 'TT-905'
let outboxId = 0

beforeAll(async () => {
  await waitForDemoSite(sql)
  const tagId = await createTestTag(sql, TAG, 'R-100', 1)
  const res = await call('/api/rules', { method: 'POST', cookie: await signInAs('engineer'), json: {
    targetKind: 'tag', tagId, name: `${TAG} high limit`, measure: 'value', comparison: 'above', threshold: 100,
    priority: 'urgent', alarmClass: 'alarm', consequence: 'Test column flooding.', likelyCause: 'Reflux valve stuck.',
    operatorAction: 'Reduce the test column feed.', timeToRespondS: 600,
  } })
  if (res.status !== 201) throw new Error(`rule create answered ${res.status}`)
  const t0 = Date.now() - 60_000
  await ingestAll([90, 101].map((value, i) => ({ tag: TAG, time: new Date(t0 + i * 1000).toISOString(), value })))
  await runServerTask('indicators:refresh')
  const [row] = await sql`select o.id from notification_outbox o join alarms a on a.id = o.alarm_id
    join tags t on t.id = a.tag_id where t.code = ${TAG} and o.kind = 'alarm'`
  outboxId = row!.id
})

const attempts = () => sql`select ok, at from outbox_attempts where outbox_id = ${outboxId} order by id`

describe('the mail relay down while the server runs', () => {
  it('retries with backoff while it is down and delivers exactly one mail once it is back', async () => {
    // An instance whose scheduled sender (every 5 s) is the only one running; Nitro runs its
    // schedule only outside test mode.
    await startServerInstance({ NUXT_SMTP_URL: `smtp://127.0.0.1:${relayPort}`, NODE_ENV: 'production', TEST: '', NUXT_SENDER_SCHEDULED: 'true' })
    await expect.poll(async () => (await attempts()).length, { timeout: 90_000, interval: 500 }).toBeGreaterThanOrEqual(2)
    const failed = await attempts()
    expect(failed.every(a => a.ok === false)).toBe(true)
    // Backoff: after the first failure the next try waits at least half the first delay of 5 s
    // (equal jitter, shared/utils/retryDelay.ts; RETRY in server/services/mail/mailSender.ts).
    expect(new Date(failed[1]!.at).getTime() - new Date(failed[0]!.at).getTime()).toBeGreaterThanOrEqual(2_500)
    const [queued] = await sql`select status from notification_outbox where id = ${outboxId}`
    expect(queued!.status).toBe('pending')

    relay = await startLocalMailbox({ smtpPort: relayPort, httpPort: 0, dir: mkdtempSync(join(tmpdir(), 'brinkline-relay-')) })
    const mine = async () => (await mailboxMessages(relay!.httpPort)).filter(m => m.subject.includes(TAG))
    await expect.poll(async () => (await mine()).length, { timeout: 120_000, interval: 500 }).toBe(1)
    const [sent] = await sql`select status, attempts from notification_outbox where id = ${outboxId}`
    expect(sent!.status).toBe('sent')
    const trail = await attempts()
    expect(trail.map(a => a.ok)).toEqual([...trail.slice(0, -1).map(() => false), true])
    expect(sent!.attempts).toBe(trail.length)
    // Two more sender periods find nothing left to send: still one copy.
    await new Promise(resolve => setTimeout(resolve, 11_000))
    expect(await mine()).toHaveLength(1)
    expect(await attempts()).toHaveLength(trail.length)
  })
})
