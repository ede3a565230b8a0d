import { describe, expect, it } from 'vitest'
import { seriousA11yViolations } from '../support/axe'
import { chromiumOnDemoSite, screenshot, signInThroughForm } from '../support/browser'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { ingestAll, runServerTask } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'

// Issue 13 item 9: the admin reads the database's size and growth and sets a site's raw window.
await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
const browser = chromiumOnDemoSite(sql)

const MIB = 1024 * 1024

describe('admin storage page', () => {
  it('shows size, bytes per sample, growth with its chart and projection, per-table sizes, and sets a raw window', async () => {
    const start = Date.now() - 2 * 3_600_000
    await ingestAll(Array.from({ length: 3600 }, (_, i) => ({ tag: 'TI-401', time: new Date(start + i * 1000).toISOString(), value: 40 + (i % 17) / 4 })))
    await runServerTask('storage:maintain')
    // A day of hourly snapshots growing 256 KiB an hour: the page must say 6 MiB a day
    // (straight-line arithmetic [common practice]).
    await sql`delete from storage_snapshots`
    const [now] = await sql`select pg_database_size(current_database())::float8 as bytes`
    const hourly = Array.from({ length: 25 }, (_, h) => ({
      at: new Date(Date.now() - (24 - h) * 3_600_000), bytes: Math.round(now!.bytes - (24 - h) * MIB / 4),
    }))
    for (const s of hourly) await sql`insert into storage_snapshots (taken_at, database_bytes, sample_rows, archive_rows) values (${s.at}, ${s.bytes}, 0, 0)`

    const page = await browser.newPage()
    await signInThroughForm(page, 'admin')
    await page.getByRole('link', { name: 'Storage' }).click()
    await page.getByRole('heading', { name: /database storage/i }).waitFor()
    await expect.poll(() => page.getByText('6 MiB a day').count()).toBe(1)
    const bytesPerSample = await page.locator('dt', { hasText: 'Bytes per raw sample' }).locator('xpath=following-sibling::dd[1]').innerText()
    expect(Number(bytesPerSample)).toBeGreaterThan(0)
    await page.locator('canvas').first().waitFor()
    const tables = await page.getByRole('row').allInnerTexts()
    expect(tables.some(r => r.startsWith('samples\t'))).toBe(true)
    expect(tables.some(r => /samples_p\d/.test(r))).toBe(false)

    page.on('dialog', d => void d.accept())
    await page.getByLabel(/Raw window of/).fill('30')
    await page.getByRole('button', { name: 'Save' }).click()
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Raw samples are kept 30 days.' }).count()).toBe(1)
    const [site] = await sql`select raw_retention_days from sites s join tags t on t.site_id = s.id where t.code = 'TI-401'`
    expect(site!.raw_retention_days).toBe(30)
    expect(await seriousA11yViolations(page)).toEqual([])
    await screenshot(page, 'admin-storage')
  })
})
