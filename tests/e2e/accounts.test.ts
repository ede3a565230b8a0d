import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV, startTestMailbox } from '../support/mailbox'
import { mailboxMessages, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, DEMO_PASSWORD, demoEmail, signInAs } from '../support/session'

const { mailbox, smtpUrl } = await startTestMailbox()
await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: smtpUrl })
const sql = testSql()
afterAll(async () => { await sql.end(); await mailbox.close() })

let admin = ''
beforeAll(async () => {
  await waitForDemoSite(sql)
  admin = await signInAs('admin')
})

const signIn = (email: string, password: string) => call('/api/public/sign-in', { method: 'POST', json: { email, password } })
const cookieOf = (res: { headers: Headers }) => res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
const userId = async (email: string) => ((await sql`select id from users where email = ${email}`)[0]!.id as number)

/** The set-password link of the newest mail to `to`, after the sender ran. */
async function linkMailedTo(to: string) {
  await runServerTask('notifications:send')
  const mail = (await mailboxMessages(mailbox.httpPort)).filter(m => m.to.includes(to)).at(-1)
  expect(mail, `a mail to ${to}`).toBeDefined()
  const token = /set-password\?token=([A-Za-z0-9_-]{43})/.exec(mail!.text)?.[1]
  expect(token).toBeDefined()
  return { mail: mail!, token: token! }
}

// A pass-phrase of unrelated words, as NIST SP 800-63B-4 §3.1.1.2 encourages [from memory].
const GOOD = 'copper kettle under amber sky'

describe('users: invite, set password once, sign in', () => {
  it('creates a user whose one-time link arrives by mail, works once, and signs them in', async () => {
    const email = 'new.engineer@harrowgate.example'
    const created = await call('/api/admin/users', { method: 'POST', cookie: admin, json: { email, name: 'Nia Brook', role: 'engineer' } })
    expect(created.status).toBe(201)
    expect(JSON.stringify(created.body)).not.toMatch(/password_?hash/i)
    // No password yet: nothing signs in.
    expect((await signIn(email, GOOD)).status).toBe(401)
    const { mail, token } = await linkMailedTo(email)
    expect(mail.subject).toBe('Brinkline: set your password')
    expect(mail.text).toContain(ADVISORY_CAUTION)
    expect(mail.text).toContain('http://brinkline.test:3000/set-password?token=')
    // The delivered outbox row keeps no usable copy of the token.
    const [row] = await sql`select body from notification_outbox where kind = 'account' and ${email} = any(recipients) order by id desc limit 1`
    expect(row!.body).not.toContain(token)

    expect((await call(`/api/public/password-link?token=${token}`)).body).toMatchObject({ email, name: 'Nia Brook', purpose: 'invite' })
    const set = await call('/api/public/set-password', { method: 'POST', json: { token, password: GOOD } })
    expect(set.status).toBe(200)
    const again = await call('/api/public/set-password', { method: 'POST', json: { token, password: `${GOOD} again` } })
    expect(again.status).toBe(410)
    expect(again.body.message).toMatch(/^token: /)
    expect((await call(`/api/public/password-link?token=${token}`)).status).toBe(410)

    const signedIn = await signIn(email, GOOD)
    expect(signedIn.status).toBe(200)
    expect(signedIn.body.user.role).toBe('engineer')
    const [audit] = await sql`select detail from audit_log where action = 'user.create' and target = ${email}`
    expect(audit!.detail.after).toMatchObject({ email, role: 'engineer' })
  })

  it('refuses a second account for the same address with 409 naming the field', async () => {
    const res = await call('/api/admin/users', { method: 'POST', cookie: admin, json: { email: demoEmail('operator'), name: 'Twin', role: 'operator' } })
    expect(res.status).toBe(409)
    expect(res.body.message).toMatch(/^email: /)
  })

  it('refuses short and common passwords by name, and accepts a 64-character one', async () => {
    const email = 'rules@harrowgate.example'
    await call('/api/admin/users', { method: 'POST', cookie: admin, json: { email, name: 'Rae Rules', role: 'operator' } })
    const { token } = await linkMailedTo(email)
    // NIST SP 800-63B-4 §3.1.1.2 [from memory]: minimum length (15 for a single factor), a
    // blocklist of common passwords, at least 64 characters accepted, no composition rules.
    const short = await call('/api/public/set-password', { method: 'POST', json: { token, password: 'Tr0ub4dor&3' } })
    expect(short.status).toBe(400)
    expect(short.body.message).toMatch(/password: must have at least 15 characters/)
    // 'qwerty123456789' is in the zxcvbn-ts common-password dictionary (@zxcvbn-ts/language-common 4.1.3).
    const common = await call('/api/public/set-password', { method: 'POST', json: { token, password: 'qwerty123456789' } })
    expect(common.status).toBe(400)
    expect(common.body.message).toMatch(/password: is on the list of commonly used passwords/)
    const long = 'a quiet morning on the cooling tower walkway with a flask of tea'
    expect(long).toHaveLength(64)
    expect((await call('/api/public/set-password', { method: 'POST', json: { token, password: long } })).status).toBe(200)
    expect((await signIn(email, long)).status).toBe(200)
  })
})

describe('sessions follow the account', () => {
  it('ends a disabled user\'s session on the next request, and lets them back after re-enabling', async () => {
    const operator = await signInAs('operator')
    expect((await call('/api/units', { cookie: operator })).status).toBe(200)
    const id = await userId(demoEmail('operator'))
    const off = await call(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, json: { active: false } })
    expect(off.status).toBe(200)
    const refused = await call('/api/units', { cookie: operator })
    expect(refused.status).toBe(401)
    expect(refused.body.message).toMatch(/disabled/)
    expect((await signIn(demoEmail('operator'), DEMO_PASSWORD)).status).toBe(401)
    const [audit] = await sql`select detail from audit_log where action = 'user.update' and target = ${demoEmail('operator')} order by id desc limit 1`
    expect(audit!.detail.before.active).toBe(true)
    expect(audit!.detail.after.active).toBe(false)
    expect((await call(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, json: { active: true } })).status).toBe(200)
    expect((await signIn(demoEmail('operator'), DEMO_PASSWORD)).status).toBe(200)
  })

  it('ends the session of a user whose role changed; the new sign-in carries the new role', async () => {
    const supervisor = await signInAs('supervisor')
    const id = await userId(demoEmail('supervisor'))
    expect((await call(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, json: { role: 'operator' } })).status).toBe(200)
    const refused = await call('/api/units', { cookie: supervisor })
    expect(refused.status).toBe(401)
    expect(refused.body.message).toMatch(/role changed to operator/)
    // The browser's own session view says signed out too.
    expect((await call('/api/_auth/session', { cookie: supervisor })).status).toBe(401)
    const again = await signIn(demoEmail('supervisor'), DEMO_PASSWORD)
    expect(again.body.user.role).toBe('operator')
    await call(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, json: { role: 'supervisor' } })
  })

  it('ends all of a user\'s sessions on request', async () => {
    const a = await signInAs('engineer')
    const b = await signInAs('engineer')
    const id = await userId(demoEmail('engineer'))
    expect((await call(`/api/admin/users/${id}/end-sessions`, { method: 'POST', cookie: admin })).status).toBe(200)
    expect((await call('/api/units', { cookie: a })).status).toBe(401)
    expect((await call('/api/units', { cookie: b })).status).toBe(401)
    expect((await call('/api/units', { cookie: await signInAs('engineer') })).status).toBe(200)
  })
})

describe('the last active admin', () => {
  it('cannot be demoted or disabled (409 with a message), while a second admin exists it can', async () => {
    const id = await userId(demoEmail('admin'))
    const demote = await call(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, json: { role: 'engineer' } })
    expect(demote.status).toBe(409)
    expect(demote.body.message).toMatch(/last active admin/)
    const disable = await call(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, json: { active: false } })
    expect(disable.status).toBe(409)
    const [row] = await sql`select role, active from users where id = ${id}`
    expect(row).toEqual({ role: 'admin', active: true })
  })
})

describe('password reset and own change', () => {
  it('mails a reset link; the old password works until the link is used, then only the new one', async () => {
    const email = demoEmail('engineer')
    const id = await userId(email)
    const old = await signInAs('engineer')
    expect((await call(`/api/admin/users/${id}/password-reset`, { method: 'POST', cookie: admin })).status).toBe(202)
    const { mail, token } = await linkMailedTo(email)
    expect(mail.subject).toBe('Brinkline: choose a new password')
    expect((await signIn(email, DEMO_PASSWORD)).status).toBe(200)
    expect((await call('/api/public/set-password', { method: 'POST', json: { token, password: GOOD } })).status).toBe(200)
    expect((await signIn(email, DEMO_PASSWORD)).status).toBe(401)
    expect((await call('/api/units', { cookie: old })).status).toBe(401)
    expect((await signIn(email, GOOD)).status).toBe(200)
  })

  it('lets a user change their own password only with the current one; this session stays, others end', async () => {
    const email = 'new.engineer@harrowgate.example'
    const here = cookieOf(await signIn(email, GOOD))
    const elsewhere = cookieOf(await signIn(email, GOOD))
    const wrong = await call('/api/session/password', { method: 'POST', cookie: here, json: { currentPassword: 'not it', newPassword: 'slate harbour lantern orchard' } })
    expect(wrong.status).toBe(403)
    expect(wrong.body.message).toMatch(/^currentPassword: /)
    const res = await call('/api/session/password', { method: 'POST', cookie: here, json: { currentPassword: GOOD, newPassword: 'slate harbour lantern orchard' } })
    expect(res.status).toBe(200)
    const renewed = cookieOf(res) || here
    expect((await call('/api/units', { cookie: renewed })).status).toBe(200)
    expect((await call('/api/units', { cookie: elsewhere })).status).toBe(401)
    expect((await signIn(email, 'slate harbour lantern orchard')).status).toBe(200)
  })

  it('answers 401 to anonymous and 403 to non-admin calls of the user routes', async () => {
    expect((await call('/api/admin/users', { method: 'POST', json: { email: 'x@y.example', name: 'X Y', role: 'admin' } })).status).toBe(401)
    const operator = await signInAs('operator')
    expect((await call('/api/admin/users', { method: 'POST', cookie: operator, json: { email: 'x@y.example', name: 'X Y', role: 'admin' } })).status).toBe(403)
    expect((await sql`select 1 from users where email = 'x@y.example'`).length).toBe(0)
  })
})
