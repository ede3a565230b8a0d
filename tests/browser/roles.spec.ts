import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { launchChromium, screenshot, signInThroughForm } from '../support/browser'
import type { Role } from '../../shared/utils/roles'

await setupBuiltServer()

// docs/design.md §D2.1: each role sees its own work. Admin pages are only in the admin's navigation.
const EXPECTED_NAV: Record<Role, string[]> = {
  operator: ['Overview', 'Alarms', 'Units', 'Tags', 'Shift log', 'Incidents', 'Alarm health'],
  engineer: ['Overview', 'Alarms', 'Units', 'Tags', 'Shift log', 'Incidents', 'Alarm health', 'Workbench', 'Upload history'],
  supervisor: ['Overview', 'Alarms', 'Units', 'Tags', 'Shift log', 'Incidents', 'Alarm health'],
  admin: ['Overview', 'Alarms', 'Units', 'Tags', 'Shift log', 'Incidents', 'Alarm health', 'Users', 'Gateways', 'OPC UA', 'Notification routes', 'Audit log', 'Storage'],
}

/** Pages with nothing to list in the seeded demo, and the empty state each must show. The demo
 * plant reaches Brinkline over HTTP ingest only so far, so it has no OPC UA connection. */
const EMPTY_IN_DEMO: Partial<Record<string, string>> = { 'OPC UA': 'No connections yet.' }
let context: BrowserContext
beforeAll(async () => { context = await launchChromium() })
afterAll(async () => { await context?.close() })

describe('each role signs in and sees its pages', () => {
  it('sends a signed-out visitor to the sign-in page', async () => {
    const page = await context.newPage()
    await page.goto(url('/tags'))
    await page.waitForURL(/\/sign-in\?redirect=/)
    await screenshot(page, 'sign-in')
    await page.close()
  })

  for (const role of Object.keys(EXPECTED_NAV) as Role[]) {
    it(`${role}: navigation and every page render real rows`, async () => {
      await context.clearCookies()
      const page = await context.newPage()
      await signInThroughForm(page, role)
      const nav = page.getByRole('navigation', { name: 'Main' }).getByRole('link')
      expect(await nav.allTextContents()).toEqual(EXPECTED_NAV[role])
      for (const label of EXPECTED_NAV[role]) {
        await nav.getByText(label, { exact: true }).click()
        await page.getByRole('heading', { name: label }).first().waitFor()
        const empty = EMPTY_IN_DEMO[label]
        // Table rows, or the overview's tiles; a page the demo leaves empty says so instead.
        if (empty) await page.getByText(empty).waitFor()
        else await expect.poll(() => page.locator('tbody tr, [data-tile]').count()).toBeGreaterThan(0)
        await screenshot(page, `${role}-${label.toLowerCase().replace(/\s+/g, '-')}`)
      }
      await page.close()
    })
  }
})
