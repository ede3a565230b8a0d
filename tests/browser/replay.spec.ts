import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { chromiumOnDemoSite, screenshot, signInThroughForm, waitForHydration } from '../support/browser'
import { testSql } from '../support/db'
import { busToCollapse, FIXED_START_MS, tagWithDemoRules } from '../support/demoPlant'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, runServerTask } from '../support/pipeline'
import { typedPlantTime } from '../support/plantTime'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

// The replay workbench (issue 14 item 4): an engineer asks for a replay of stored history with a
// marked event, reloads the page while the job runs, and reads the saved report.
await setupBuiltServer({ ...MANUAL_TICKS_ENV, BRINKLINE_REPLAY_WORKER: '1' })
const sql = testSql()
const browser = chromiumOnDemoSite(sql)

describe('engineer replays stored history on the workbench', () => {
  it('queues a replay, follows its progress through a reload and reads the report with the advisory caution', async () => {
    await sql`insert into units (site_id, code, name, kind) select site_id, 'B-371', 'Workbench load bus', kind from units where code = 'B-300'`
    await tagWithDemoRules(sql, await signInAs('engineer'), 'EI-371', 'B-371', 2, 'EI-301')
    const { samples, tipMs } = busToCollapse()
    const shift = FIXED_START_MS - tipMs!
    const rows = samples.filter(s => s.tag === 'EI-301' && s.time <= tipMs!).map(s => ({ tag: 'EI-371', time: new Date(s.time + shift).toISOString(), value: s.value }))
    await ingestAll(rows)

    const page = await browser.newPage()
    await signInThroughForm(page, 'engineer')
    await page.goto(url('/workbench'))
    await page.getByRole('link', { name: 'Replays' }).click()
    await page.getByRole('heading', { name: 'Workbench · replays' }).waitFor()
    await waitForHydration(page)
    const form = page.getByRole('form', { name: 'New replay', exact: true })
    await form.getByRole('combobox', { name: /^Tag/ }).selectOption({ label: 'EI-371 — Test signal EI-371' })
    await form.getByRole('textbox', { name: /^From/ }).fill(typedPlantTime(Date.parse(rows[0]!.time) - 60_000))
    await form.getByRole('textbox', { name: /^To \(/ }).fill(typedPlantTime(FIXED_START_MS))
    await form.getByRole('textbox', { name: /^Known event/ }).fill(typedPlantTime(FIXED_START_MS))
    // The approach is under an hour long: a 30-minute window leaves normal operation before it.
    await form.getByRole('textbox', { name: /^Warning window/ }).fill('30')
    await form.getByRole('textbox', { name: /^Note/ }).fill('bus collapse, demo')
    await form.getByRole('button', { name: 'Queue replay' }).click()
    await page.waitForURL(/\/workbench\/replays\/\d+$/)
    // The job runs on the server: a reload finds it where it is, queued, running or done.
    await page.reload()
    await page.getByRole('heading', { name: /^Replay \d+ · EI-371$/ }).waitFor()
    expect(await page.getByRole('note').first().textContent()).toContain('Advisory only')
    await page.getByRole('heading', { name: 'Report' }).waitFor({ timeout: 600_000 })
    const summary = await page.getByTestId('replay-summary').textContent()
    expect(summary).toMatch(/Earliest warning: .* before the event/)
    await expect.poll(() => page.getByRole('table', { name: 'What would have fired' }).locator('tbody tr').filter({ hasText: 'would have raised' }).count()).toBeGreaterThan(0)
    expect(await page.getByRole('img', { name: 'Value, with what would have fired chart' }).count()).toBe(1)
    await screenshot(page, 'engineer-replay-report')
    const reportUrl = page.url()

    await page.getByRole('link', { name: 'All replays' }).click()
    const list = page.getByRole('table', { name: 'Replays' })
    await list.waitFor()
    expect(await list.locator('tbody tr').first().textContent()).toContain('bus collapse, demo')
    expect(await page.getByRole('progressbar').first().getAttribute('aria-valuenow')).toBe('100')
    await screenshot(page, 'engineer-replay-list')

    // The same history again with a stricter α per look, then both side by side.
    const firstId = Number(/\/replays\/(\d+)$/.exec(reportUrl)![1])
    await page.goto(reportUrl)
    await page.getByRole('link', { name: 'Same history, other settings' }).click()
    const again = page.getByRole('form', { name: 'New replay', exact: true })
    await again.getByRole('textbox', { name: /^α per look/ }).waitFor()
    expect(await again.getByRole('textbox', { name: /^From/ }).inputValue()).toBe(typedPlantTime(Date.parse(rows[0]!.time) - 60_000) + ':00')
    await again.getByRole('textbox', { name: /^α per look/ }).fill('0.001')
    await again.getByRole('button', { name: 'Queue replay' }).click()
    await page.waitForURL(url => /\/workbench\/replays\/\d+$/.test(url.pathname) && !url.pathname.endsWith(`/${firstId}`))
    await page.getByRole('heading', { name: 'Report' }).waitFor({ timeout: 600_000 })
    const secondId = Number(/\/replays\/(\d+)$/.exec(page.url())![1])
    await page.getByRole('link', { name: 'All replays' }).click()
    await page.getByRole('checkbox', { name: `Compare replay ${firstId}` }).check()
    await page.getByRole('checkbox', { name: `Compare replay ${secondId}` }).check()
    await page.getByRole('link', { name: /side by side/ }).click()
    const compared = page.getByRole('table', { name: 'Replays compared' })
    await compared.waitFor()
    expect(await compared.locator('tr').filter({ hasText: 'α per look (differs)' }).textContent()).toContain('0.001')
    expect(await page.getByText('not of the same history').count()).toBe(0)
    await screenshot(page, 'engineer-replay-compare')
  }, 900_000)

  it('replays a historian file, shows the lines it refused, and reports on the file alone', async () => {
    await sql`insert into units (site_id, code, name, kind) select site_id, 'B-372', 'Workbench load bus, file', kind from units where code = 'B-300'`
    await tagWithDemoRules(sql, await signInAs('engineer'), 'EI-372', 'B-372', 2, 'EI-301')
    const { samples, tipMs } = busToCollapse()
    const shift = FIXED_START_MS - tipMs!
    const lines = samples.filter(s => s.tag === 'EI-301' && s.time <= tipMs!).map(s => `${new Date(s.time + shift).toISOString()},EI-372,${s.value}`)
    lines.splice(3, 0, 'not a time,EI-372,1')
    const page = await browser.newPage()
    await signInThroughForm(page, 'engineer')
    await page.goto(url('/workbench/replays'))
    await waitForHydration(page)
    const form = page.getByRole('form', { name: 'New replay of a file' })
    await form.getByRole('combobox', { name: /^Tag whose settings/ }).selectOption({ label: 'EI-372 — Test signal EI-372' })
    await form.locator('input[name="replayFile"]').setInputFiles({ name: 'bus-collapse.csv', mimeType: 'text/csv', buffer: Buffer.from(['time,tag,value', ...lines].join('\n')) })
    await form.getByTestId('replay-file-mapping').waitFor()
    await form.getByRole('textbox', { name: /^Known event/ }).fill(typedPlantTime(FIXED_START_MS))
    await form.getByRole('textbox', { name: /^Warning window/ }).fill('30')
    await form.getByRole('button', { name: 'Queue replay of the file' }).click()
    const result = form.getByTestId('replay-file-result')
    await result.waitFor()
    expect(await result.textContent()).toContain('1 line was refused')
    expect(await result.textContent()).toContain('line 5, time')
    await screenshot(page, 'engineer-replay-file-refused-lines')
    await result.getByRole('link', { name: 'Open the replay' }).click()
    await page.getByRole('heading', { name: 'Report' }).waitFor({ timeout: 600_000 })
    expect(await page.getByTestId('replay-summary').textContent()).toMatch(/Earliest warning: .* before the event/)
    expect(await page.getByRole('link', { name: 'Same file, other settings' }).count()).toBe(1)
    await screenshot(page, 'engineer-replay-file-report')
  }, 900_000)

  it('replays a unit\'s slow-mode rules over its recorded fits', async () => {
    await sql`insert into units (site_id, code, name, kind) select site_id, 'B-373', 'Workbench load bus, unit rule', kind from units where code = 'B-300'`
    const [unit] = await sql`select id from units where code = 'B-373'`
    for (const code of ['EI-373', 'JI-373']) await createTestTag(sql, code, 'B-373', 2)
    const rule = await call('/api/rules', {
      method: 'POST', cookie: await signInAs('engineer'),
      json: {
        targetKind: 'unit', unitId: unit!.id, name: 'B-373 slow mode below 1e9', measure: 'recovery_rate', comparison: 'below', threshold: 1e9,
        priority: 'low', alarmClass: 'alert', consequence: 'c', likelyCause: 'c', operatorAction: 'c', timeToRespondS: 600,
      },
    })
    expect(rule.status, JSON.stringify(rule.body)).toBe(201)
    const { samples, tipMs } = busToCollapse()
    const shift = FIXED_START_MS - tipMs!
    const rows = samples.filter(s => s.time <= tipMs!).map(s => ({ tag: s.tag === 'EI-301' ? 'EI-373' : 'JI-373', time: new Date(s.time + shift).toISOString(), value: s.value }))
    const chunk = Math.ceil(rows.length / 3)
    for (let i = 0; i < rows.length; i += chunk) {
      await ingestAll(rows.slice(i, i + chunk))
      await runServerTask('indicators:refresh')
    }
    const page = await browser.newPage()
    await signInThroughForm(page, 'engineer')
    await page.goto(url('/workbench/replays'))
    await waitForHydration(page)
    const form = page.getByRole('form', { name: 'New replay', exact: true })
    await form.getByRole('combobox', { name: /^Tag, or unit/ }).selectOption({ label: 'B-373 — Workbench load bus, unit rule' })
    await form.getByText('over the slow-mode fits the live pipeline recorded').waitFor()
    expect(await form.getByRole('checkbox', { name: /Try other indicator settings/ }).count()).toBe(0)
    await form.getByRole('textbox', { name: /^From/ }).fill(typedPlantTime(Date.parse(rows[0]!.time) - 60_000))
    await form.getByRole('textbox', { name: /^To \(/ }).fill(typedPlantTime(FIXED_START_MS))
    await form.getByRole('button', { name: 'Queue replay' }).click()
    await page.waitForURL(/\/workbench\/replays\/\d+$/)
    await page.getByRole('heading', { name: /^Replay \d+ · B-373$/ }).waitFor()
    await page.getByRole('heading', { name: 'Report' }).waitFor({ timeout: 600_000 })
    expect(await page.getByTestId('replay-summary').textContent()).toMatch(/Slow-mode fits replayed: [1-9]/)
    expect(await page.getByRole('img', { name: 'Unit slow-mode recovery rate, with what would have fired chart' }).count()).toBe(1)
    expect(await page.getByRole('table', { name: 'What would have fired' }).locator('tbody tr').filter({ hasText: 'B-373 slow mode below 1e9' }).count()).toBeGreaterThan(0)
    await screenshot(page, 'engineer-replay-unit-report')
  }, 900_000)
})
