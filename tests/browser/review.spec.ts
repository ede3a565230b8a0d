import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { launchChromium, screenshot, signInThroughForm } from '../support/browser'
import { testSql } from '../support/db'
import { createTestTag, ingestAll, tick, waitForDemoSite } from '../support/pipeline'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { activation, insertOccurrence, insertRule, oneShot } from '../support/reviewFixtures'
import { wallClockText } from '../../shared/utils/timeText'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
let context: BrowserContext
const MIN = 60_000
// Whole hours back from now, so the default period (the last 7 days) holds all of it.
const BASE = Math.floor(Date.now() / 3_600_000) * 3_600_000 - 20 * 60 * MIN
// The R-100 approach: its slowing-down alert, 20 min before its limit alarm.
const APPROACH = BASE + 6 * 3_600_000
const SLOWING = { from: APPROACH - 22 * MIN, to: APPROACH + 3 * MIN }

beforeAll(async () => {
  await waitForDemoSite(sql)
  // A flood of 12 alarms in ten minutes, a chattering rule, an advisory alert and a stale alarm.
  for (let i = 0; i < 12; i++) await oneShot(sql, await insertRule(sql, { unitCode: 'T-400', priority: i < 9 ? 'low' : 'medium' }), BASE + i * 20_000)
  const chatter = await insertRule(sql, { unitCode: 'T-400', name: 'Review chatter fixture' })
  await insertOccurrence(sql, chatter, [activation(BASE + 3 * 3_600_000),
    ...[1, 2, 3].flatMap(k => [{ at: BASE + 3 * 3_600_000 + k * 15_000 - 5000, event: 'return', from: 'unacknowledged', to: 'rtn_unacknowledged' },
      { at: BASE + 3 * 3_600_000 + k * 15_000, event: 'activate', from: 'rtn_unacknowledged', to: 'unacknowledged' }])], BASE + 3 * 3_600_000 + MIN)
  await oneShot(sql, await insertRule(sql, { unitCode: 'T-400', alarmClass: 'alert', measure: 'early_warning' }), BASE + 5 * 3_600_000)
  await insertOccurrence(sql, await insertRule(sql, { unitCode: 'T-400', priority: 'high' }), [activation(BASE - 30 * 3_600_000)], null)
  // An approach on R-100: the slowing-down alert 20 min before the limit alarm, grouped by a tick.
  // The tag's samples (a slow sine with noise, ours) give the timeline something to draw; the tag is
  // not watched, so the tick raises nothing from them.
  const approach = APPROACH
  const tt950 = await createTestTag(sql, 'TT-950', 'R-100', 10)
  await sql`update tags set watched = false where code = 'TT-950'`
  await ingestAll(Array.from({ length: 540 }, (_, i) => ({
    tag: 'TT-950', time: new Date(approach - 45 * MIN + i * 10_000).toISOString(), value: 380 + 4 * Math.sin(i / 40) + ((i * 7919) % 13) / 13,
  })))
  // Stored evaluations of TT-950 every minute, "slowing down" from 22 min before the alert to 3 min
  // after it (ours): the judgement strip and its words must show exactly that run. TT-951 has
  // samples but no evaluations, for the tag picker.
  await sql`insert into indicator_points ${sql(Array.from({ length: 61 }, (_, k) => {
    const at = approach - 30 * MIN + k * MIN
    const slowing = at >= SLOWING.from && at <= SLOWING.to
    return { tag_id: tt950, time: new Date(at), evidence: slowing ? 'slowing down' : 'no trend', p_ar1: slowing ? 0.02 : 0.5 }
  }))}`
  await createTestTag(sql, 'TT-951', 'R-100', 10)
  await sql`update tags set watched = false where code = 'TT-951'`
  await ingestAll(Array.from({ length: 540 }, (_, i) => ({ tag: 'TT-951', time: new Date(approach - 45 * MIN + i * 10_000).toISOString(), value: 12 + ((i * 7919) % 17) / 17 })))
  await oneShot(sql, await insertRule(sql, { unitCode: 'R-100', tagCode: 'TT-950', alarmClass: 'alert', measure: 'early_warning', name: 'R-100 slowing down' }), approach)
  await oneShot(sql, await insertRule(sql, { unitCode: 'R-100', tagCode: 'TT-950', priority: 'high', name: 'R-100 high temperature' }), approach + 20 * MIN)
  await tick()
  context = await launchChromium()
})
afterAll(async () => { await context?.close(); await sql.end() })

describe('supervisor review pages', () => {
  it('alarm health shows each figure with its target and source, both charts and the lists behind them', async () => {
    const page = await context.newPage()
    await signInThroughForm(page, 'operator')
    await page.goto(url('/review/health'))
    const figures = page.getByTestId('health-figures')
    await figures.waitFor()
    const peak = figures.locator('[data-figure="peakPer10Min"]')
    await expect.poll(() => peak.textContent()).toContain('12')
    expect(await peak.textContent()).toContain('ISA-18.2 / IEC 62682')
    expect(await peak.textContent()).toContain('beyond target')
    expect(await figures.locator('[data-figure="averagePer10Min"]').textContent()).toContain('EEMUA 191')
    expect(await page.locator('canvas').count()).toBeGreaterThanOrEqual(2)
    expect(await page.getByTestId('chattering').textContent()).toContain('Review chatter fixture')
    expect(await page.getByTestId('stale').locator('li').count()).toBe(1)
    await screenshot(page, 'review-health')
    // A chosen period, typed on the plant's clock: the flood's hour alone is 12 alarms in 6 periods.
    await page.getByRole('radio', { name: 'chosen period' }).click()
    const zoneOf = (await sql`select time_zone from sites limit 1`)[0]!.time_zone as string
    const wall = (ms: number) => wallClockText(new Date(ms).toISOString(), zoneOf).slice(0, 16)
    await page.getByLabel(/^From/).fill(wall(BASE))
    await page.getByLabel(/^To/).fill(wall(BASE + 3_600_000))
    await page.getByRole('button', { name: 'Show' }).click()
    await expect.poll(() => page.getByText(/ten-minute periods/).textContent()).toContain('12 alarms and 0 advisory alerts')
    expect(await page.getByText(/ten-minute periods/).textContent()).toContain('in 6 ten-minute periods')
    await page.close()
  })

  it('a supervisor reviews an incident, writes the findings and closes it with a sign-off; an operator reads it', async () => {
    await context.clearCookies()
    const page = await context.newPage()
    await signInThroughForm(page, 'supervisor')
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Incidents' }).click()
    const row = page.getByTestId('incident-list').locator('tr', { hasText: 'R-100' })
    await row.waitFor()
    expect(await row.textContent()).toContain('20 min before')
    // The site's window, set by the supervisor from the list (30 min by default).
    const windowField = page.getByRole('spinbutton', { name: 'Incident window' })
    await expect.poll(() => windowField.inputValue()).toBe('30')
    await windowField.fill('45')
    await page.getByRole('form', { name: 'Incident window' }).getByRole('button', { name: 'Save' }).click()
    await page.getByText('Saved.').waitFor()
    expect(Number((await sql`select incident_window_s from site_review_settings`)[0]!.incident_window_s)).toBe(2700)
    await screenshot(page, 'review-incidents')
    await row.getByRole('link').click()
    const verdict = page.getByTestId('early-warning-verdict')
    await verdict.waitFor()
    expect(await verdict.textContent()).toContain('The early warning came before the limit alarm: 20 min before')
    expect(await page.getByTestId('incident-members').locator('tbody tr').count()).toBe(2)
    await page.getByRole('button', { name: 'Start review' }).click()
    await expect.poll(() => page.getByTestId('incident-state').first().textContent()).toContain('under review')
    await page.getByLabel('What happened').fill('Reactor temperature rose to its high limit.')
    await page.getByLabel('Cause').fill('Cooling water flow fell (fouled exchanger).')
    await page.getByLabel('Actions').fill('Exchanger cleaned; feed cut while it was.')
    await page.getByLabel('Lessons').fill('The slowing-down alert gave 20 minutes: act on it.')
    await page.getByRole('button', { name: 'Save findings' }).click()
    await page.getByRole('button', { name: 'Close and sign off' }).click()
    const signOff = page.getByTestId('sign-off')
    await expect.poll(() => signOff.textContent()).toContain('Signed off by Sam Okafor')
    expect(await page.getByTestId('findings').textContent()).toContain('Cooling water flow fell')
    await screenshot(page, 'review-incident-closed')
    const timeline = page.getByTestId('incident-timeline')
    await timeline.locator('canvas').first().waitFor()
    // The alarm's tag by default: value, variance, recovery rate and the judgement strip, whose
    // words name the run of "slowing down" the stored evaluations hold.
    const tt950 = timeline.locator('[data-tag="TT-950"]')
    await expect.poll(() => tt950.locator('.uplot').count()).toBe(4)
    const runTimes = () => tt950.getByTestId('slowing-down-runs').locator('time').evaluateAll(ts => ts.map(t => t.getAttribute('datetime')))
    const expectedRun = [new Date(SLOWING.from).toISOString(), new Date(SLOWING.to).toISOString()]
    expect(await runTimes()).toEqual(expectedRun)
    await screenshot(page, 'review-incident-timeline')
    // Every tag of the unit can be picked; TT-951 (no evaluations stored) joins the axis.
    const picker = page.getByTestId('timeline-tag-picker')
    const unitCodes = (await sql`select t.code from tags t join units u on u.id = t.unit_id where u.code = 'R-100'`).map(r => r.code as string)
    const offered = (await picker.locator('label').allTextContents()).map(text => text.replace('(retired)', '').trim())
    expect([...offered].sort()).toEqual([...unitCodes].sort())
    await picker.getByRole('checkbox', { name: 'TT-951' }).check()
    const tt951 = timeline.locator('[data-tag="TT-951"]')
    await expect.poll(() => tt951.locator('.uplot').count()).toBe(3)
    expect(await tt951.getByTestId('no-judgement').isVisible()).toBe(true)
    await screenshot(page, 'review-incident-timeline-picked')
    const path = new URL(page.url()).pathname
    // The report, as Chromium prints it, with the tags picked: every section, the caution, no navigation.
    await page.getByRole('link', { name: 'Printable report' }).click()
    await page.getByTestId('incident-report').waitFor()
    await page.emulateMedia({ media: 'print' })
    for (const section of ['early-warning', 'alarms', 'timeline', 'events', 'findings'])
      expect(await page.locator(`[data-section="${section}"]`).isVisible(), section).toBe(true)
    const printed = page.locator('[data-section="timeline"]')
    await expect.poll(() => printed.locator('[data-tag="TT-951"] .uplot').count()).toBe(3)
    expect(await printed.locator('[data-tag="TT-950"]').getByTestId('slowing-down-runs').locator('time').evaluateAll(ts => ts.map(t => t.getAttribute('datetime')))).toEqual(expectedRun)
    expect(await page.getByTestId('timeline-tag-picker').count()).toBe(0)
    expect(await page.getByTestId('report-caution').textContent()).toContain('Advisory only')
    expect(await page.getByTestId('report-sign-off').textContent()).toContain('Sam Okafor')
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false)
    const pdf = await page.pdf({ format: 'A4', printBackground: true })
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
    await screenshot(page, 'review-incident-report-print')
    await page.emulateMedia({ media: 'screen' })
    await context.clearCookies()
    await signInThroughForm(page, 'operator')
    await page.goto(url(path))
    await page.getByTestId('findings').waitFor()
    expect(await page.getByRole('button', { name: 'Save findings' }).count()).toBe(0)
    expect(await page.getByTestId('sign-off').textContent()).toContain('Sam Okafor')
    await page.close()
  })

  it('a supervisor opens an incident by hand from an alarm\'s page', async () => {
    await context.clearCookies()
    const page = await context.newPage()
    await signInThroughForm(page, 'supervisor')
    const [alarm] = await sql`select a.id from alarms a join alarm_rules r on r.id = a.rule_id where r.name = 'Review chatter fixture'`
    await page.goto(url(`/alarms/${alarm!.id}`))
    const box = page.getByTestId('alarm-incident')
    await expect.poll(() => box.textContent()).toContain('Incident: #')
    await box.getByRole('button', { name: 'Open a new incident with it' }).click()
    await page.waitForURL(/\/review\/incidents\/\d+$/)
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('T-400: opened by hand')
    expect(await page.getByTestId('incident-members').locator('tbody tr').count()).toBe(1)
    await page.close()
  })

  it('the shift handover shows its four sections on one page and prints without the navigation', async () => {
    await context.clearCookies()
    const page = await context.newPage()
    await signInThroughForm(page, 'operator')
    await page.goto(url('/shift-log'))
    await page.getByRole('link', { name: 'Handover page (prints)' }).click()
    await page.getByTestId('shift-handover').waitFor()
    for (const section of ['notes', 'alarms', 'shelved', 'incidents'])
      expect(await page.locator(`[data-section="${section}"]`).isVisible(), section).toBe(true)
    // The stale fixture alarm still stands; its unit's incident is not closed.
    expect(await page.locator('[data-section="alarms"] tbody tr').count()).toBeGreaterThan(0)
    expect(await page.locator('[data-section="incidents"]').textContent()).toContain('T-400')
    await screenshot(page, 'shift-handover')
    await page.emulateMedia({ media: 'print' })
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false)
    await screenshot(page, 'shift-handover-print')
    await page.close()
  })
})
