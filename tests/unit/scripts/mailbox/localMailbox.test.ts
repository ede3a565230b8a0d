import { mkdtemp, readFile, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import nodemailer from 'nodemailer'
import type Mail from 'nodemailer/lib/mailer'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startLocalMailbox, type RunningLocalMailbox } from '../../../../scripts/mailbox/localMailbox'
import type { CaughtMessage } from '../../../../scripts/mailbox/mailStore'

let mailbox: RunningLocalMailbox
let dir: string
let base: string

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'brinkline-mail-'))
  mailbox = await startLocalMailbox({ smtpPort: 0, httpPort: 0, dir })
  base = `http://127.0.0.1:${mailbox.httpPort}`
})

afterAll(async () => {
  await mailbox.close()
  await rm(dir, { recursive: true, force: true })
})

function send(message: Mail.Options) {
  const transport = nodemailer.createTransport({ host: '127.0.0.1', port: mailbox.smtpPort, secure: false, ignoreTLS: true })
  return transport.sendMail({ from: 'Brinkline <alerts@fenwick.example>', ...message })
}

describe('local mailbox', () => {
  it('stores a sent message and serves it as JSON, newest first', async () => {
    await fetch(`${base}/api/messages`, { method: 'DELETE' })
    await send({ to: 'ops@fenwick.example', subject: 'first', text: 'one' })
    await send({ to: ['a@fenwick.example', 'b@fenwick.example'], subject: 'R-100 advisory', text: 'TI-101 slowing down', html: '<p>TI-101 <b>slowing</b></p>' })
    const list = await (await fetch(`${base}/api/messages`)).json() as CaughtMessage[]
    expect(list.map(m => m.subject)).toEqual(['R-100 advisory', 'first'])
    const [latest] = list
    expect(latest).toMatchObject({ from: '"Brinkline" <alerts@fenwick.example>', to: ['a@fenwick.example', 'b@fenwick.example'], text: 'TI-101 slowing down' })
    expect(latest!.html).toContain('<b>slowing</b>')
    expect(Number.isNaN(Date.parse(latest!.date))).toBe(false)

    const one = await (await fetch(`${base}/api/messages/${latest!.id}`)).json() as CaughtMessage
    expect(one).toEqual(latest)
    expect((await fetch(`${base}/api/messages/nope`)).status).toBe(404)
    // Persisted as JSON lines.
    const lines = (await readFile(join(dir, 'messages.jsonl'), 'utf8')).trim().split('\n')
    expect(lines).toHaveLength(2)
  })

  it('accepts a sender that logs in, since auth is optional', async () => {
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port: mailbox.smtpPort, secure: false, ignoreTLS: true, auth: { user: 'app', pass: 'anything' } })
    await transport.sendMail({ from: 'app@fenwick.example', to: 'ops@fenwick.example', subject: 'with login', text: 'x' })
    const list = await (await fetch(`${base}/api/messages`)).json() as CaughtMessage[]
    expect(list[0]!.subject).toBe('with login')
  })

  it('shows an escaped inbox page and a message page', async () => {
    await send({ to: 'ops@fenwick.example', subject: '<script>alert(1)</script> & more', text: 'body <i>text</i>' })
    const inbox = await (await fetch(`${base}/`)).text()
    expect(inbox).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; more')
    expect(inbox).not.toContain('<script>')
    const [latest] = await (await fetch(`${base}/api/messages`)).json() as CaughtMessage[]
    expect(inbox).toContain(`/messages/${latest!.id}`)
    const page = await (await fetch(`${base}/messages/${latest!.id}`)).text()
    expect(page).toContain('body &lt;i&gt;text&lt;/i&gt;')
    expect(page).not.toContain('<script>')
  })

  it('clears all messages on DELETE /api/messages', async () => {
    expect((await fetch(`${base}/api/messages`, { method: 'DELETE' })).status).toBe(204)
    expect(await (await fetch(`${base}/api/messages`)).json()).toEqual([])
    expect((await readFile(join(dir, 'messages.jsonl'), 'utf8')).trim()).toBe('')
  })
})
