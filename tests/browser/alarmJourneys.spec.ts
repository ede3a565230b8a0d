import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { testSql } from '../support/db'
import { startTestMailbox, MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, mailboxMessages, tick, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { launchChromium, screenshot, signInThroughForm, waitForHydration } from '../support/browser'
import { call, signInAs } from '../support/session'
import { expectAccessible } from '../support/axe'

// What an operator sees of issue 12's alarm fixes: a re-raised alarm reads as new, an alarm from
// old history is recorded without its own mail, the e-mail link opens the alarm's trail, a
// shelved alarm stays visible on its tile.
const { mailbox, smtpUrl } = await startTestMailbox()
await setupBuiltServer({ ...MANUAL_TICKS_ENV, NUXT_SMTP_URL: smtpUrl })
const sql = testSql()
let context: BrowserContext
let page: Page
let operator = ''
const LIVE = 'TT-907'
const OLD = 'TT-908'
const ruleOf = (tagId: number, code: string) => ({
  targetKind: 'tag', tagId, name: `${code} high limit`, measure: 'value', comparison: 'above', threshold: 100,
  priority: 'high', alarmClass: 'alarm', consequence: 'Test vessel over-temperature.', likelyCause: 'Heater stuck on.',
  operatorAction: `Switch the ${code} heater off.`, timeToRespondS: 600,
})
const alarmIdOf = async (code: string) => Number((await sql`select a.id from alarms a join tags t on t.id = a.tag_id where t.code = ${code}`)[0]!.id)

beforeAll(async () => {
  await waitForDemoSite(sql)
  const engineer = await signInAs('engineer')
  operator = await signInAs('operator')
  for (const code of [LIVE, OLD]) {
    const tagId = await createTestTag(sql, code, 'T-400', 1)
    const res = await call('/api/rules', { method: 'POST', cookie: engineer, json: ruleOf(tagId, code) })
    if (res.status !== 201) throw new Error(`rule create answered ${res.status}`)
  }
  context = await launchChromium()
  page = await context.newPage()
  await signInThroughForm(page, 'operator')
})
afterAll(async () => { await context?.close(); await sql.end(); await mailbox.close() })

describe('alarm journeys (issue 12)', () => {
  let firstMs = 0
  let againMs = 0
  it('shows a re-raised alarm at its latest activation, with the count and when it first began (item 1)', async () => {
    firstMs = Date.now() - 20 * 60_000
    againMs = Date.now() - 2 * 60_000
    await ingestAll([{ tag: LIVE, time: new Date(firstMs - 1000).toISOString(), value: 95 },
      { tag: LIVE, time: new Date(firstMs).toISOString(), value: 104 },
      { tag: LIVE, time: new Date(firstMs + 1000).toISOString(), value: 96 }])
    await tick()
    await ingestAll([{ tag: LIVE, time: new Date(againMs).toISOString(), value: 111 }])
    await tick()
    await page.goto(url('/alarms'))
    const row = page.getByTestId('alarm-row').filter({ hasText: `${LIVE} high limit` })
    await row.waitFor()
    const cell = row.getByTestId('alarm-activated')
    await expect.poll(() => cell.textContent()).toMatch(/ago/)
    const text = (await cell.textContent())!
    // Plant time of the re-activation, not of the first raise; the demo site is on Europe/London.
    const wall = (ms: number) => new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/London', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' }).format(ms)
    expect(text).toContain(wall(againMs))
    expect(text).toMatch(/2 min ago/)
    expect(text).toMatch(/activation 2 · first .*/)
    expect(text).toContain(wall(firstMs))
    await screenshot(page, 'journey-reraise-list')
    await expectAccessible(page, 'alarm list with a re-raised alarm')
  })

  it('opens the alarm from its e-mail link: every event with who, when and comment, and acknowledges it there (item 4)', async () => {
    const id = await alarmIdOf(LIVE)
    const mail = (await mailboxMessages(mailbox.httpPort)).filter(m => m.subject.includes(LIVE)).at(-1)
    expect(mail, 'no mail for the re-activation').toBeTruthy()
    const link = /Open the alarm: (\S+)/.exec(mail!.text)![1]!
    expect(link).toBe(`http://brinkline.test:3000/alarms/${id}`)
    await page.goto(url(new URL(link).pathname))
    await waitForHydration(page)
    await page.getByRole('heading', { name: new RegExp(`#${id} ${LIVE} high limit`) }).waitFor()
    await expect(page.getByTestId('latest-activation').textContent()).resolves.toMatch(/at 111 K \(activation 2\)/)
    await page.getByLabel('Comment').fill('Heater isolated per procedure')
    await page.getByRole('button', { name: 'Acknowledge' }).click()
    const events = page.getByTestId('alarm-event')
    await expect.poll(() => events.count()).toBe(4)
    const rows = await events.allTextContents()
    expect(rows[0]).toMatch(/activated.*normal → unacknowledged.*Brinkline \(automatic\).*104 K/)
    expect(rows[1]).toMatch(/returned to normal.*Brinkline \(automatic\)/)
    expect(rows[2]).toMatch(/activated again \(activation 2\).*111 K/)
    expect(rows[3]).toMatch(/acknowledged.*Olu Mensah.*Heater isolated per procedure/)
    await expect(page.getByTestId('alarm-state').textContent()).resolves.toBe('acknowledged')
    // Every time reads in plant time with its zone, and in UTC on hover (issue 14 item 6).
    const firstTime = page.getByTestId('alarm-event').first().locator('time').first()
    expect(await firstTime.textContent()).toMatch(/Europe\/London$/)
    expect(await firstTime.getAttribute('title')).toMatch(/\d{2}:\d{2}:\d{2} UTC$/)
    await screenshot(page, 'journey-alarm-trail')
    await expectAccessible(page, 'alarm page')
    // Older mails linked to /alarms?id=N: they land on the same page.
    await page.goto(url(`/alarms?id=${id}`))
    await page.waitForURL(new RegExp(`/alarms/${id}$`))
  })

  it('records an alarm from two-hour-old back-filled samples without mailing it, and says why on its page (item 2)', async () => {
    const start = Date.now() - 2 * 3_600_000
    await ingestAll([95, 104, 105].map((value, i) => ({ tag: OLD, time: new Date(start + i * 1000).toISOString(), value })))
    await tick()
    const id = await alarmIdOf(OLD)
    expect((await mailboxMessages(mailbox.httpPort)).filter(m => m.subject.includes(OLD))).toHaveLength(0)
    await page.goto(url(`/alarms/${id}`))
    const first = page.getByTestId('alarm-event').first()
    await first.waitFor()
    await expect(first.textContent()).resolves.toMatch(/from old history .*no mail of its own, listed in the site's history summary/)
    await expect(page.getByText(/First raised/).locator('..').textContent()).resolves.toMatch(/2 h 0\d min ago/)
    await screenshot(page, 'journey-old-history-alarm')
  })

  it('keeps a shelved alarm with a live excursion in view on its tile (item 3, ISA-101)', async () => {
    const id = await alarmIdOf(OLD)
    const shelved = await call(`/api/alarms/${id}/shelve`, { method: 'POST', cookie: operator, json: { reason: 'Transmitter under test by instruments', minutes: 60 } })
    expect(shelved.status).toBe(200)
    await page.setViewportSize({ width: 1600, height: 1000 })
    await page.goto(url('/'))
    const tile = page.locator('[data-tile]', { hasText: OLD })
    const marker = tile.getByTestId('tile-set-aside')
    await marker.waitFor()
    await expect(marker.textContent()).resolves.toMatch(new RegExp(`SHELVED ${OLD} high limit · condition active now, until .*Europe/London`))
    await expect(tile.getByTestId('tile-alarms').textContent()).resolves.toMatch(/no unacknowledged alarms/)
    // The other test tag's acknowledged, still-active alarm puts its operator action on the tile.
    await expect(page.locator('[data-tile]', { hasText: LIVE }).getByTestId('tile-action').textContent()).resolves.toBe(`Switch the ${LIVE} heater off.`)
    await screenshot(page, 'journey-tile-shelved')
    await expectAccessible(page, 'overview with a shelved alarm')
  })

  it('fills 1600 px and 2560 px screens with tiles, with a wall-display density (item 6), and takes arrow keys at once (item 7)', async () => {
    const filled = async () => page.evaluate(() => {
      const grid = document.querySelector('[data-testid="overview-grid"]')!.getBoundingClientRect()
      const tiles = [...document.querySelectorAll('[data-tile]')].map(t => t.getBoundingClientRect())
      // Rows of tiles: every row must reach the grid's right edge (no wide empty strip).
      const rows = new Map<number, number>()
      for (const r of tiles) rows.set(Math.round(r.top), Math.max(rows.get(Math.round(r.top)) ?? 0, r.right))
      return { share: Math.min(...rows.values()) / grid.right, lastUnitTop: [...document.querySelectorAll('[data-testid="overview-grid"] section')].at(-1)!.getBoundingClientRect().top }
    })
    await page.goto(url('/'))
    await page.locator('[data-tile]').first().waitFor()
    const desk = await filled()
    expect(desk.share).toBeGreaterThan(0.97)
    expect(desk.lastUnitTop, 'the fourth unit is below the fold at 1600 × 1000').toBeLessThan(1000)
    await screenshot(page, 'journey-overview-1600')
    await page.keyboard.press('ArrowRight')
    expect(await page.locator('[data-tile]').first().evaluate(el => el === document.activeElement)).toBe(true)

    await page.setViewportSize({ width: 2560, height: 1440 })
    await page.getByRole('radio', { name: 'Wall display' }).click()
    await expect.poll(async () => (await filled()).share).toBeGreaterThan(0.97)
    const fontPx = await page.getByTestId('tile-value').first().evaluate(el => Number.parseFloat(getComputedStyle(el).fontSize))
    expect(fontPx).toBeGreaterThanOrEqual(48)
    expect((await filled()).lastUnitTop).toBeLessThan(1440)
    await screenshot(page, 'journey-overview-2560-wall')
    // Remembered on this workstation.
    await page.reload()
    await expect.poll(() => page.getByRole('radio', { name: 'Wall display' }).getAttribute('aria-checked')).toBe('true')
    await page.getByRole('radio', { name: 'Standard' }).click()
    await page.setViewportSize({ width: 1440, height: 900 })
  })

  it('says on the tile when the trend tests last ran and how often (item 5)', async () => {
    // A 30 s tag is re-tested every 20 samples (evaluateEvery, docs/science.md §S8.2): every
    // 10 min, so its τ and p stand still between tests. The tile's stored result is written here
    // as the pipeline would (no tick runs in this file unless asked), tested 4 min ago.
    const tagId = await createTestTag(sql, 'AT-930', 'T-400', 30)
    await ingestAll([{ tag: 'AT-930', time: new Date(Date.now() - 10_000).toISOString(), value: 300 }])
    await sql`insert into tag_status (tag_id, status, reason, leading_indicator, leading_value, tau, p_value)
      values (${tagId}, 'steady', '', 'ar1', 0.61, 0.12, 0.4)
      on conflict (tag_id) do update set leading_indicator = 'ar1', leading_value = 0.61, tau = 0.12, p_value = 0.4`
    await sql`insert into tag_analysis_state (tag_id, last_evaluated_time) values (${tagId}, ${new Date(Date.now() - 4 * 60_000)})
      on conflict (tag_id) do update set last_evaluated_time = excluded.last_evaluated_time`
    await page.goto(url('/'))
    const tile = page.locator('[data-tile]', { hasText: 'AT-930' })
    await expect.poll(() => tile.getByTestId('tile-trend-tested').textContent()).toMatch(/^tested \d min ago, every 10 min$/)
    // 4 min, or 5 on a machine slow enough to take half a minute to draw the page.
    expect(Number((await tile.getByTestId('tile-trend-tested').textContent())!.match(/\d+/)![0])).toBeGreaterThanOrEqual(4)
    await screenshot(page, 'journey-tile-trend-tested')
  })
})
