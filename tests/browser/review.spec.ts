import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { launchChromium, screenshot, signInThroughForm } from '../support/browser'
import { testSql } from '../support/db'
import { waitForDemoSite } from '../support/pipeline'
import { activation, insertOccurrence, insertRule, oneShot } from '../support/reviewFixtures'

await setupBuiltServer()
const sql = testSql()
let context: BrowserContext
const MIN = 60_000
// Whole hours back from now, so the default period (the last 7 days) holds all of it.
const BASE = Math.floor(Date.now() / 3_600_000) * 3_600_000 - 20 * 60 * MIN

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
    await page.close()
  })
})
