import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { setupBuiltServer } from '../support/server'
import { launchChromium, screenshot, signInThroughForm } from '../support/browser'

await setupBuiltServer()

let context: BrowserContext
beforeAll(async () => { context = await launchChromium() })
afterAll(async () => { await context?.close() })

describe('admin manages gateways', () => {
  it('creates a gateway, sees its key once, and the key works for ingest', async () => {
    const page = await context.newPage()
    await signInThroughForm(page, 'admin')
    await page.goto(url('/admin/gateways'))
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
