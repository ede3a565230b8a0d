import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { ADVISORY_CAUTION } from '../../shared/alarms/vocabulary'
import { MANUAL_TICKS_ENV, startTestMailbox } from '../support/mailbox'
import { freeLoopbackPort } from '../support/opcua'
import { mailboxMessages, runServerTask } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call } from '../support/session'
import { launchChromium, screenshot, signInThroughForm, waitForHydration } from '../support/browser'

// The server mails through the local mailbox, and its public URL is its own address, so the link
// in a mail is followed as it stands.
const { mailbox, smtpUrl } = await startTestMailbox()
const port = await freeLoopbackPort()
await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: smtpUrl, NUXT_PUBLIC_URL: `http://127.0.0.1:${port}` }, { port })

let context: BrowserContext
beforeAll(async () => { context = await launchChromium() })
afterAll(async () => { await context?.close(); await mailbox.close() })

/** The newest mail to `to` once the sender has run (the scheduler is off: the test runs it). */
async function mailTo(to: string) {
  await runServerTask('notifications:send')
  const mail = (await mailboxMessages(mailbox.httpPort)).filter(m => m.to.includes(to)).at(-1)
  expect(mail, `a mail to ${to} in the local mailbox`).toBeDefined()
  return mail!
}

const ingestWith = (key: string) => call('/api/ingest', {
  method: 'POST', headers: { authorization: `Bearer ${key}` }, json: { samples: [{ tag: 'TI-401', time: '2026-06-02T00:00:00Z', value: 45 }] },
})

describe('admin manages gateways', () => {
  it('creates a gateway, sees its key once, and the key works for ingest', async () => {
    const page = await context.newPage()
    await signInThroughForm(page, 'admin')
    await page.goto(url('/admin/gateways'))
    await waitForHydration(page)
    await page.getByLabel('Name').fill('Boiler house edge box')
    await page.getByRole('button', { name: 'Create and show key' }).click()
    const key = (await page.getByTestId('new-gateway-key').locator('code').first().textContent())!.trim()
    expect(key).toMatch(/^bk_/)
    await expect.poll(() => page.getByRole('cell', { name: 'Boiler house edge box' }).count()).toBe(1)
    await screenshot(page, 'admin-gateway-created')
    const res = await fetch(url('/api/ingest'), {
      method: 'POST', headers: { 'authorization': `Bearer ${key}`, 'content-type': 'application/json' },
      body: JSON.stringify({ samples: [{ tag: 'TI-401', time: '2026-06-01T00:00:00Z', value: 44 }] }),
    })
    expect(res.status).toBe(200)
    page.on('dialog', d => void d.accept())
    await page.getByRole('row', { name: /Boiler house edge box/ }).getByRole('button', { name: 'Revoke' }).click()
    await expect.poll(() => page.getByRole('row', { name: /Boiler house edge box/ }).getByText('revoked').count()).toBe(1)
    await page.reload()
    expect(await page.getByTestId('new-gateway-key').count()).toBe(0)
  })
})

// Issue 16: an admin's day — a new colleague, a key rotation and a new mail route, each seen
// arriving where it should.
describe('admin journey: a user, a key rotation and a mail route', () => {
  it('creates a user whose set-password link arrives by mail and works once', async () => {
    const page = await context.newPage()
    await signInThroughForm(page, 'admin')
    await page.goto(url('/admin/users'))
    await waitForHydration(page)
    const email = 'ines.halloran@harrowgate.example'
    await page.getByLabel('E-mail').fill(email)
    await page.getByLabel('Full name').fill('Ines Halloran')
    await page.locator('select[name="new-user-role"]').selectOption('operator')
    await page.getByRole('button', { name: 'Create and send link' }).click()
    await page.getByRole('status').filter({ hasText: email }).waitFor()
    await expect.poll(() => page.getByRole('row', { name: new RegExp(email) }).getByText('invited (no password yet)').count()).toBe(1)
    await screenshot(page, 'admin-journey-user-invited')

    const mail = await mailTo(email)
    expect(mail.subject).toBe('Brinkline: set your password')
    expect(mail.text).toContain(ADVISORY_CAUTION)
    const link = new RegExp(`http://127\\.0\\.0\\.1:${port}/set-password\\?token=[A-Za-z0-9_-]{43}`).exec(mail.text)?.[0]
    expect(link, 'the set-password link in the mail').toBeDefined()

    // A pass-phrase of unrelated words (NIST SP 800-63B-4 §3.1.1.2 [from memory]).
    const password = 'lantern orchard copper violin'
    const linkPage = await context.newPage()
    await linkPage.goto(link!)
    await waitForHydration(linkPage)
    await linkPage.getByText('Ines Halloran').waitFor()
    await screenshot(linkPage, 'admin-journey-set-password')
    await linkPage.getByLabel('New password').fill(password)
    await linkPage.getByLabel('Repeat the password').fill(password)
    await linkPage.getByRole('button', { name: 'Set password' }).click()
    await linkPage.getByTestId('password-set').waitFor()
    const signedIn = await call('/api/public/sign-in', { method: 'POST', json: { email, password } })
    expect(signedIn.status).toBe(200)
    expect(signedIn.body.user.role).toBe('operator')

    // Used once: the same link now refuses, in words.
    await linkPage.goto(link!)
    await expect.poll(() => linkPage.getByRole('alert').textContent()).toMatch(/used or has expired/)
    expect(await linkPage.getByLabel('New password').count()).toBe(0)
    await screenshot(linkPage, 'admin-journey-set-password-used')
    await page.reload()
    await expect.poll(() => page.getByRole('row', { name: new RegExp(email) }).getByText('active', { exact: true }).count()).toBe(1)
  })

  it('rotates a gateway key: the new key works and the old one stops at once', async () => {
    const page = await context.newPage()
    await page.goto(url('/admin/gateways'))
    await waitForHydration(page)
    await page.getByLabel('Name').fill('Tank farm edge box')
    await page.getByRole('button', { name: 'Create and show key' }).click()
    const oldKey = (await page.getByTestId('new-gateway-key').locator('code').first().textContent())!.trim()
    expect((await ingestWith(oldKey)).status).toBe(200)

    const row = page.getByRole('row', { name: /Tank farm edge box/ })
    await row.getByLabel('Old key of Tank farm edge box after rotation').selectOption({ label: 'stops at once' })
    await row.getByRole('button', { name: 'Rotate key' }).click()
    const panel = page.getByTestId('rotated-gateway-key')
    await panel.getByText('The old key has stopped working.').waitFor()
    const newKey = (await panel.locator('code').textContent())!.trim()
    expect(newKey).toMatch(/^bk_/)
    expect(newKey).not.toBe(oldKey)
    // Only the new key stays on screen: the creation panel's key has just stopped.
    expect(await page.getByTestId('new-gateway-key').count()).toBe(0)
    // The list shows the new key by its prefix (docs/design.md §D2.2: 8 characters kept), and the sample sent with the old one.
    await expect.poll(() => row.getByText(newKey.slice(0, 8)).count()).toBe(1)
    await expect.poll(() => row.getByRole('cell', { name: '1', exact: true }).count()).toBeGreaterThan(0)
    await screenshot(page, 'admin-journey-key-rotated')
    expect((await ingestWith(newKey)).status).toBe(200)
    expect((await ingestWith(oldKey)).status).toBe(401)
  })

  it('adds a mail route whose test e-mail arrives and shows as sent in its delivery log', async () => {
    const page = await context.newPage()
    await page.goto(url('/admin/routes'))
    await waitForHydration(page)
    const to = 'night.lead@harrowgate.example'
    await page.getByLabel('Name', { exact: true }).fill('Night shift lead')
    await page.getByLabel('Recipient e-mail').fill(to)
    await page.getByRole('button', { name: 'Add route' }).click()
    const row = page.getByRole('row', { name: /Night shift lead/ }).first()
    await row.waitFor()
    await row.getByRole('button', { name: 'Send test e-mail' }).click()
    await page.getByRole('status').filter({ hasText: 'Test message queued' }).waitFor()

    const mail = await mailTo(to)
    expect(mail.subject).toBe('Brinkline: test message for route "Night shift lead"')
    expect(mail.text).toContain(ADVISORY_CAUTION)
    await page.getByRole('button', { name: 'Refresh' }).click()
    const log = page.getByTestId('route-deliveries')
    await expect.poll(() => log.getByRole('cell', { name: 'sent', exact: true }).count()).toBe(1)
    expect(await log.getByRole('cell', { name: to }).count()).toBe(1)
    await screenshot(page, 'admin-journey-route-test-sent')
  })
})

describe('admin reads the audit log', () => {
  it('types its period on the plant clock in the tables\' year-month-day order (issue 12 item 8)', async () => {
    const page = await context.newPage()
    await page.goto(url('/admin/audit'))
    const from = page.getByLabel('From (Europe/London)')
    await from.waitFor()
    expect(await from.getAttribute('placeholder')).toBe('yyyy-mm-dd hh:mm')
    expect(await from.getAttribute('type')).not.toBe('datetime-local')
    // A month-first date is refused with the reason, not read another way.
    await from.fill('06/01/2026 00:00')
    await from.press('Enter')
    await page.getByRole('alert').filter({ hasText: 'is not a date and time such as 2026-12-02 14:00' }).waitFor()
    // Midnight on 1 June 2026 in London is 23:00 UTC the day before (BST, UTC+1: IANA tz database, Rule EU).
    const [request] = await Promise.all([
      page.waitForRequest(r => r.url().includes('/api/admin/audit?') && r.url().includes('from=')),
      from.fill('2026-06-01 00:00').then(() => from.press('Enter')),
    ])
    expect(new URL(request.url()).searchParams.get('from')).toBe('2026-05-31T23:00:00.000Z')
    await screenshot(page, 'admin-audit-period')
    await page.close()
  })
})
