import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { SMTPServer } from 'smtp-server'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV, startTestMailbox } from '../support/mailbox'
import { createTestTag, ingestAll, mailboxMessages, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer, startServerInstance } from '../support/server'
import { call, signInAs } from '../support/session'

// A server instance killed (SIGKILL: no shutdown code runs) in the middle of its work loses and
// duplicates no mail: an alarm and its outbox row are written in the transaction that moves the
// tag's claim (docs/design.md §D4 items 3 and 5), so a crash before the commit leaves neither, and
// the next tick on any instance redoes the batch. PostgreSQL rolls back the open transaction of a
// client that went away (PostgreSQL manual, "Transactions" / backend termination [from memory]).

const { mailbox, smtpUrl } = await startTestMailbox()

/**
 * A mail relay that takes the connection and then never answers MAIL FROM: the sender stays
 * inside its outbox transaction, with no message handed over, until the test lets go.
 */
const held: (() => void)[] = []
let mailFromSeen = 0
const stalling = new SMTPServer({
  authOptional: true, disabledCommands: ['STARTTLS'], logger: false,
  onMailFrom(_address, _session, callback) { mailFromSeen++; held.push(() => callback(new Error('relay went away'))) },
  onData(stream, _session, callback) { stream.resume(); stream.on('end', () => callback()) },
})
await new Promise<void>(resolve => stalling.listen(0, '127.0.0.1', () => resolve()))
const stallingUrl = `smtp://127.0.0.1:${(stalling.server.address() as { port: number }).port}`

await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: smtpUrl })
const sql = testSql()
afterAll(async () => {
  for (const release of held.splice(0)) release()
  await new Promise<void>(resolve => stalling.close(() => resolve()))
  await sql.end()
  await mailbox.close()
})

const TAGS = 120
const codes = Array.from({ length: TAGS }, (_, i) => `TK-${700 + i}`)
/** Tags with a limit rule: one in each part of the tag list, so they fall in different batches. */
const RULED = [0, 60, 119]
const LOCKED = 60
const tagIds: number[] = []
const t0 = Date.now() - 300_000

async function limitRule(cookie: string, tagId: number, code: string) {
  const res = await call('/api/rules', { method: 'POST', cookie, json: {
    targetKind: 'tag', tagId, name: `${code} kill test limit`, measure: 'value', comparison: 'above', threshold: 100,
    priority: 'urgent', alarmClass: 'alarm', consequence: 'Test vessel over-temperature.', likelyCause: 'Test heater stuck on.',
    operatorAction: 'Isolate the test heater.', timeToRespondS: 600,
  } })
  if (res.status !== 201) throw new Error(`rule create answered ${res.status}: ${JSON.stringify(res.body)}`)
}

const samples = (from: number, to: number, value: (i: number) => number) => codes.flatMap(tag =>
  Array.from({ length: to - from }, (_, k) => ({ tag, time: new Date(t0 + (from + k) * 1000).toISOString(), value: value(from + k) })))

/** Mails the good relay received that name the tag. */
const mailsNaming = async (code: string) => (await mailboxMessages(mailbox.httpPort)).filter(m => `${m.subject}\n${m.text}`.includes(code))

async function waitFor<T>(what: string, read: () => Promise<T>, done: (v: T) => boolean, timeoutMs = 60_000): Promise<T> {
  const until = Date.now() + timeoutMs
  for (;;) {
    const value = await read()
    if (done(value)) return value
    if (Date.now() > until) throw new Error(`timed out waiting for ${what} (last: ${JSON.stringify(value)})`)
    await new Promise(resolve => setTimeout(resolve, 100))
  }
}

const claimsAt = async (time: Date) => (await sql`select count(*)::int as n from tag_analysis_state
  where tag_id in ${sql(tagIds)} and last_sample_time = ${time}`)[0]!.n as number

beforeAll(async () => {
  await waitForDemoSite(sql)
  for (const code of codes) tagIds.push(await createTestTag(sql, code, 'R-100', 1))
  const cookie = await signInAs('engineer')
  for (const i of RULED) await limitRule(cookie, tagIds[i]!, codes[i]!)
  // A first stretch below the limit, processed: every tag has its claim and status row.
  await ingestAll(samples(0, 20, () => 50))
  await runServerTask('indicators:refresh')
  expect(await claimsAt(new Date(t0 + 19_000))).toBe(TAGS)
})

describe('a server instance killed mid-tick', () => {
  it('leaves the batch it was inside untouched; the next tick raises each alarm once and each is mailed once', async () => {
    await ingestAll(samples(20, 60, i => (i >= 40 ? 150 : 50)))
    const doomed = await startServerInstance()
    // Hold the status row of one ruled tag: the batch holding it stops at its status write, after
    // its points, alarm and outbox row were written but before its commit.
    const lock = await sql.reserve()
    await lock`begin`
    await lock`select 1 from tag_status where tag_id = ${tagIds[LOCKED]!} for update`
    const tick = runServerTask('indicators:refresh', doomed.url).catch((err: Error) => err)
    const waiting = await waitFor('the tick to wait on the held status row', () => sql`select pid, query from pg_stat_activity
      where wait_event_type = 'Lock' and query ilike '%insert into "tag_status"%'`, rows => rows.length > 0)
    // And the other batches of that same tick have committed: it is truly in the middle.
    const newest = new Date(t0 + 59_000)
    await waitFor('the other batches to commit', () => claimsAt(newest), n => n > 0)
    await doomed.stop('SIGKILL')
    await lock`rollback`
    lock.release()
    expect(await tick).toBeInstanceOf(Error)
    await waitFor('the killed instance\'s session to end', () => sql`select 1 from pg_stat_activity where pid = ${waiting[0]!.pid}`, rows => rows.length === 0)

    const partly = await claimsAt(newest)
    expect(partly).toBeGreaterThan(0)
    expect(partly).toBeLessThan(TAGS)
    const [lockedClaim] = await sql`select last_sample_time from tag_analysis_state where tag_id = ${tagIds[LOCKED]!}`
    expect(new Date(lockedClaim!.last_sample_time).getTime()).toBe(t0 + 19_000)
    expect(await sql`select id from alarms where tag_id = ${tagIds[LOCKED]!}`).toHaveLength(0)

    // The surviving instance finishes the work, and sends.
    await runServerTask('indicators:refresh')
    expect(await claimsAt(newest)).toBe(TAGS)
    const alarms = await sql`select tag_id, count(*)::int as n from alarms where tag_id in ${sql(RULED.map(i => tagIds[i]!))} group by tag_id`
    expect(alarms.map(a => a.n)).toEqual([1, 1, 1])
    const outbox = await sql`select o.alarm_id from notification_outbox o join alarms a on a.id = o.alarm_id
      where a.tag_id in ${sql(RULED.map(i => tagIds[i]!))} and o.kind = 'alarm'`
    expect(outbox).toHaveLength(RULED.length)
    await runServerTask('notifications:send')
    await runServerTask('notifications:send')
    for (const i of RULED) expect(await mailsNaming(codes[i]!), codes[i]).toHaveLength(1)
  })

  it('killed while handing a mail to the relay: the message stays queued and the survivor sends it once', async () => {
    // A tag that has been above the limit for a while gets its rule now: the next sample raises it.
    const target = 30
    await limitRule(await signInAs('engineer'), tagIds[target]!, codes[target]!)
    await ingestAll([{ tag: codes[target]!, time: new Date(t0 + 60_000).toISOString(), value: 150 }])
    await runServerTask('indicators:refresh')
    const [queued] = await sql`select o.id, o.status, o.attempts from alarms a join notification_outbox o on o.alarm_id = a.id
      where a.tag_id = ${tagIds[target]!}`
    expect(queued).toMatchObject({ status: 'pending', attempts: 0 })

    const doomed = await startServerInstance({ NUXT_SMTP_URL: stallingUrl })
    const send = runServerTask('notifications:send', doomed.url).catch((err: Error) => err)
    await waitFor('the sender to reach the relay', async () => mailFromSeen, n => n > 0)
    await doomed.stop('SIGKILL')
    expect(await send).toBeInstanceOf(Error)
    for (const release of held.splice(0)) release()

    // The survivor's sender skips the row while the dead session's lock lasts, then sends it.
    await waitFor('the survivor to send the queued mail', () => runServerTask('notifications:send'), r => r.sent > 0)
    const [row] = await sql`select status, attempts from notification_outbox where id = ${queued!.id}`
    expect(row).toMatchObject({ status: 'sent', attempts: 1 })
    expect(await sql`select ok from outbox_attempts where outbox_id = ${queued!.id}`).toEqual([{ ok: true }])
    await runServerTask('notifications:send')
    expect(await mailsNaming(codes[target]!)).toHaveLength(1)
  })
})
