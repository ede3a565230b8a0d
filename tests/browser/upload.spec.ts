import { mkdtempSync, readFileSync, truncateSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { launchChromium, screenshot, signInThroughForm, waitForHydration } from '../support/browser'
import { testSql } from '../support/db'
import { MAX_UPLOAD_BYTES } from '../../shared/schemas/upload'

await setupBuiltServer()
const sql = testSql()

let context: BrowserContext
beforeAll(async () => { context = await launchChromium() })
afterAll(async () => {
  await context?.close()
  await sql.end()
})

// Plant-local (Europe/London, BST in August) times, one unknown tag on line 5.
const CSV = [
  'Timestamp,Tag,Value,Quality',
  '2025-08-04 14:00:00,TI-401,38.2,good',
  '2025-08-04 14:00:05,TI-401,38.3,good',
  '2025-08-04 14:00:00,LI-402,61.5,uncertain',
  '2025-08-04 14:00:05,XX-900,1.0,good',
].join('\n')

/** As an engineer on the upload page: a file of these lines and its preview. */
async function previewThroughPage(name: string, lines: string[]) {
  const file = join(mkdtempSync(join(tmpdir(), 'brinkline-upload-')), name)
  writeFileSync(file, lines.join('\n'))
  await context.clearCookies()
  const page = await context.newPage()
  await signInThroughForm(page, 'engineer')
  await page.goto(url('/upload'))
  await waitForHydration(page)
  await page.getByLabel('Historian CSV file').setInputFiles(file)
  await page.getByRole('heading', { name: 'Preview and column mapping' }).waitFor()
  return page
}

/** The same, then Import. */
async function importThroughPage(name: string, lines: string[]) {
  const page = await previewThroughPage(name, lines)
  await page.getByRole('button', { name: 'Import', exact: true }).click()
  return page
}

/**
 * The result's rejections table: `groups` rows, one per reason; the first names `reason`, counts
 * its `lines` and shows three of them as examples.
 */
async function expectFirstRejectionGroup(page: Page, first: { groups: number, reason: string, lines: number }) {
  const rows = page.getByRole('table', { name: 'Rejections by reason' }).locator('tbody tr')
  expect(await rows.count()).toBe(first.groups)
  expect(await rows.first().textContent()).toContain(first.reason)
  expect((await rows.first().locator('td').nth(1).textContent())?.trim()).toBe(String(first.lines))
  expect(await rows.first().getByText(/^line \d+/).count()).toBe(3)
}

describe('engineer uploads historian CSV', () => {
  it('previews, dry-runs, imports and sees the summary', async () => {
    const file = join(mkdtempSync(join(tmpdir(), 'brinkline-upload-')), 'fenwick-history.csv')
    writeFileSync(file, CSV)
    const page = await context.newPage()
    await signInThroughForm(page, 'engineer')
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Upload history' }).click()
    await page.getByRole('heading', { name: 'Upload history' }).waitFor()
    await page.getByLabel('Historian CSV file').setInputFiles(file)

    await page.getByRole('heading', { name: 'Preview and column mapping' }).waitFor()
    expect(await page.getByLabel('Layout').inputValue()).toBe('long')
    expect(await page.getByLabel('Value column').inputValue()).toBe('Value')
    expect(await page.getByLabel('Time zone').inputValue()).toBe('Europe/London')
    await expect.poll(() => page.locator('tbody tr').filter({ hasText: '2025-08-04 14:00' }).count()).toBe(4)
    await screenshot(page, 'engineer-upload-preview')

    await page.getByRole('button', { name: 'Dry run' }).click()
    const rejected = page.getByRole('table', { name: 'Rejections by reason' })
    await rejected.waitFor()
    await expect.poll(() => rejected.locator('tbody tr').first().textContent()).toContain('line 5')
    expect(await rejected.locator('tbody tr').first().textContent()).toContain('unknown tag code "XX-900"')
    expect(await page.getByTestId('upload-summary').textContent()).toContain('Samples that would be stored3')
    expect(await page.getByTestId('upload-outcome').textContent()).toBe('Dry run: 3 samples would be stored, 1 rejected. Nothing was stored.')
    await screenshot(page, 'engineer-upload-dry-run')

    await page.getByRole('button', { name: 'Import', exact: true }).click()
    await page.getByText('Samples stored', { exact: true }).waitFor()
    const summary = page.getByTestId('upload-summary')
    await expect.poll(() => summary.textContent()).toContain('Samples stored3')
    expect(await page.getByRole('progressbar', { name: 'Uploaded' }).getAttribute('aria-valuenow')).toBe('100')
    await screenshot(page, 'engineer-upload-summary')

    // 14:00 BST is 13:00 UTC (IANA tz database, Rule EU).
    const rows = await sql`select t.code, s.time, s.value, s.quality from samples s join tags t on t.id = s.tag_id
      where s.time between '2025-08-04T13:00:00Z' and '2025-08-04T13:00:05Z' order by t.code, s.time`
    expect(rows.map(r => [r.code, (r.time as Date).toISOString(), r.value, r.quality])).toEqual([
      ['LI-402', '2025-08-04T13:00:00.000Z', 61.5, 1],
      ['TI-401', '2025-08-04T13:00:00.000Z', 38.2, 0],
      ['TI-401', '2025-08-04T13:00:05.000Z', 38.3, 0],
    ])
    await page.close()
  })

  it('refuses a file past the import limit on the page, before sending any of it (issue 13 item 6)', async () => {
    const file = join(mkdtempSync(join(tmpdir(), 'brinkline-upload-')), 'decade-of-history.csv')
    writeFileSync(file, '')
    truncateSync(file, MAX_UPLOAD_BYTES + 1) // sparse: one byte over, with no disk used
    await context.clearCookies()
    const page = await context.newPage()
    const sent: string[] = []
    page.on('request', r => { if (r.url().includes('/api/uploads/')) sent.push(r.url()) })
    await signInThroughForm(page, 'engineer')
    await page.goto(url('/upload'))
    await waitForHydration(page)
    await page.getByLabel('Historian CSV file').setInputFiles(file)
    const refusal = page.getByRole('alert').filter({ hasText: 'is larger than one import takes' })
    await refusal.waitFor()
    expect(await refusal.textContent()).toBe('This file (1024.0 MB) is larger than one import takes: at most 1024.0 MB '
      + '(1073741824 bytes). Split it into several files; importing them one after another is safe.')
    expect(await page.getByRole('heading', { name: 'Preview and column mapping' }).count()).toBe(0)
    expect(sent).toEqual([])
    await screenshot(page, 'engineer-upload-too-large')
    await page.close()
  })

  it('says plainly when nothing was stored, groups the rejections by reason and offers to add the unknown tag', async () => {
    const lines = Array.from({ length: 40 }, (_, i) => `2025-08-04T15:00:${String(i).padStart(2, '0')}Z,XX-901,${i}`)
    const page = await importThroughPage('wrong-site.csv', ['time,tag,value', ...lines, '2025-08-04 25:00:00,TI-401,1'])
    const outcome = page.getByTestId('upload-outcome')
    await expect.poll(() => outcome.textContent()).toBe('Nothing was stored: every one of the 41 rows was rejected.')
    // Three examples per reason, not forty rows.
    await expectFirstRejectionGroup(page, { groups: 2, reason: 'unknown tag code "XX-901" at this site', lines: 40 })
    expect(await outcome.isVisible()).toBe(true)
    await screenshot(page, 'engineer-upload-all-rejected')

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: /rejected lines \(CSV\)/ }).click()])
    expect(download.suggestedFilename()).toBe('wrong-site-rejected-lines.csv')
    const csv = readFileSync((await download.path())!, 'utf8').split('\r\n')
    expect(csv[0]).toBe('line,column,value,reason')
    expect(csv.length).toBe(1 + 41 + 1)

    await page.getByRole('link', { name: 'Add tag XX-901 in the workbench' }).click()
    await page.getByRole('heading', { name: 'Workbench · plant model' }).waitFor()
    await expect.poll(() => page.locator('input[name="tag-code"]').last().inputValue()).toBe('XX-901')
    await page.close()
  })

  it('downloads every rejected line of a file with more than the import lists (issue 12 item 9)', async () => {
    const lines = Array.from({ length: 1_200 }, (_, i) => `2025-08-05T10:00:00Z,TI-401,bad-${i}`)
    const page = await importThroughPage('many-bad.csv', ['time,tag,value', ...lines])
    await expect.poll(() => page.getByTestId('upload-outcome').textContent()).toBe('Nothing was stored: every one of the 1,200 rows was rejected.')
    await page.getByText('For the CSV of all of them the file is read again on the server').waitFor()
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download all rejected lines (CSV)' }).click()])
    const csv = readFileSync((await download.path())!, 'utf8').split('\r\n').filter(Boolean)
    expect(csv[0]).toBe('line,column,value,reason')
    expect(csv).toHaveLength(1 + 1_200)
    expect(csv.at(-1)).toMatch(/^1201,value,bad-1199,/)
    await screenshot(page, 'engineer-upload-all-rejections-download')
    await page.close()
  })

  it('groups 400 lines with one cause as one row, keeps the result in view and links to the data (issue 12 item 9)', async () => {
    // TI-401 is ranged 0–100 °C, so values from 250 are beyond its physical bound (one range span
    // outside, server/services/ingest/ingest.ts); each reason quotes its own value.
    const good = Array.from({ length: 20 }, (_, i) => `2025-08-06T10:00:${String(i).padStart(2, '0')}Z,TI-401,41.${i % 10}`)
    const beyond = Array.from({ length: 400 }, (_, i) => `2025-08-06T11:${String(Math.floor(i / 60)).padStart(2, '0')}:${String(i % 60).padStart(2, '0')}Z,TI-401,${250 + i}`)
    const page = await importThroughPage('tank-history.csv', ['time,tag,value', ...good, ...beyond])
    const outcome = page.getByTestId('upload-outcome')
    await expect.poll(() => outcome.textContent()).toBe('20 samples stored, 400 rejected.')
    await expectFirstRejectionGroup(page, { groups: 1, reason: '… is beyond the physical bound of this tag', lines: 400 })
    // The result scrolls into view; the page stays short (it was 11,700 px with a row per line).
    await expect.poll(() => outcome.evaluate(el =>
      el.getBoundingClientRect().top >= 0 && el.getBoundingClientRect().bottom <= innerHeight)).toBe(true)
    expect(await page.evaluate(() => document.documentElement.scrollHeight)).toBeLessThan(3_000)
    await screenshot(page, 'engineer-upload-one-cause')
    await page.getByRole('link', { name: 'Show the data' }).click()
    await page.getByRole('heading', { name: /TI-401/ }).waitFor()
    await page.close()
  })

  it('maps a wide file: tag columns ticked, a column that is no tag of the site left out', async () => {
    const page = await previewThroughPage('fenwick-wide.csv',
      ['time;EI-301;JI-302;Ambient', '2025-08-05T09:00:00Z;1.01;80.5;21', '2025-08-05T09:00:02Z;1.02;;21', ''])
    expect(await page.getByLabel('Layout').inputValue()).toBe('wide')
    expect(await page.getByRole('checkbox', { name: 'EI-301' }).isChecked()).toBe(true)
    expect(await page.getByRole('checkbox', { name: /Ambient/ }).isDisabled()).toBe(true)
    await page.getByRole('button', { name: 'Import', exact: true }).click()
    await expect.poll(() => page.getByTestId('upload-summary').textContent()).toContain('Samples stored3')
    expect(await page.getByText('1 blank cells (no reading) were skipped').count()).toBe(1)
    await screenshot(page, 'engineer-upload-wide')
    await page.close()
  })

  it('does not offer the page to an operator, and says why when opened directly', async () => {
    await context.clearCookies()
    const page = await context.newPage()
    await signInThroughForm(page, 'operator')
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Upload history' }).count()).toBe(0)
    await page.goto(url('/upload'))
    await page.getByText('Uploading history needs the engineer role.').waitFor()
    await page.close()
  })
})
