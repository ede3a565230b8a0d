import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import { url } from '@nuxt/test-utils/e2e'
import { OpcuaPlantServer } from '../../simulators/lib/opcuaPlantServer'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { eventually, freeLoopbackPort } from '../support/opcua'
import { createTestTag, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { launchChromium, screenshot, signInThroughForm, waitForHydration } from '../support/browser'

// Issue 17 item 1: an admin connects Brinkline to a plant OPC UA server (a real node-opcua server
// on loopback, in this process), walks its address space, maps one variable to a tag that exists,
// makes a tag from another, and sees their values arrive. The variables are AnalogItems with
// EngineeringUnits and EURange (IEC 62541-8 §5.3.2), which the new tag's form starts from.
const pki = mkdtempSync(join(tmpdir(), 'brinkline-opcua-picker-'))
const plant = new OpcuaPlantServer({
  port: await freeLoopbackPort(),
  pkiDir: join(pki, 'plant'),
  units: [{ name: 'Dosing skid', tags: [
    { code: 'PI-701', description: 'Dosing pump discharge pressure', engineeringUnit: 'bar', rangeLow: 0, rangeHigh: 16 },
    { code: 'FI-702', description: 'Dosing flow', engineeringUnit: 'L/h', rangeLow: 0, rangeHigh: 250 },
  ] }],
})
await plant.start()
await setupBuiltServer({
  ...MANUAL_TICKS_ENV,
  BRINKLINE_OPCUA_COLLECTOR: '1',
  BRINKLINE_OPCUA_POLL_MS: '500',
  BRINKLINE_OPCUA_PKI_DIR: join(pki, 'client'),
})
const sql = testSql()
let context: BrowserContext
beforeAll(async () => {
  await waitForDemoSite(sql)
  // The tag the plant's PI-701 feeds already exists in Brinkline, under its own code.
  await createTestTag(sql, 'PI-711', 'T-400', 1)
  context = await launchChromium()
})
afterAll(async () => {
  await context?.close()
  await sql.end()
  await plant.stop()
})

const storedValues = (code: string) => sql<{ time: Date, value: number }[]>`
  select s.time, s.value from samples s join tags t on t.id = s.tag_id where t.code = ${code} order by s.time`

describe('admin browses a plant OPC UA server and maps its variables', { timeout: 400_000 }, () => {
  it('connects, browses, maps one variable, makes a tag from another, and sees values arrive', async () => {
    const page = await context.newPage()
    await signInThroughForm(page, 'admin')
    await page.goto(url('/admin/opcua'))
    await waitForHydration(page)
    await page.locator('input[name="opcua-name"]').fill('Dosing skid server')
    await page.locator('input[name="opcua-endpoint"]').fill(plant.endpointUrl)
    await page.locator('input[name="opcua-sampling"]').fill('0')
    await page.locator('input[name="opcua-publishing"]').fill('200')
    await page.getByRole('button', { name: 'Add connection' }).click()
    const row = page.getByRole('row', { name: /Dosing skid server/ })
    await row.waitFor()
    await row.getByRole('button', { name: 'Nodes' }).click()

    // What the plant shows now, before Brinkline reads it.
    for (const code of ['PI-701', 'FI-702']) plant.publish(code, 1, Date.now() - 120_000)
    await page.getByRole('button', { name: 'Open Plant' }).click()
    await page.getByRole('button', { name: 'Open Dosing skid' }).click()
    const pressure = page.locator('[data-node-id="ns=1;s=PI-701"]')
    await pressure.waitFor()
    // The server's own description, range and unit are shown beside each variable.
    await expect.poll(() => pressure.textContent()).toContain('Dosing pump discharge pressure · 0 to 16 bar')
    await screenshot(page, 'opcua-picker-browsed')

    await pressure.getByLabel('Tag for PI-701').selectOption({ label: 'PI-711 — Test signal PI-711' })
    await pressure.getByRole('button', { name: 'Map PI-701' }).click()
    await page.getByRole('button', { name: 'Save node table' }).click()
    await page.getByRole('status').filter({ hasText: 'Node table saved' }).waitFor()

    await page.getByRole('button', { name: 'New tag from FI-702' }).click()
    const form = page.getByRole('form', { name: 'New tag from FI-702' })
    // Filled from the variable: Description attribute, EngineeringUnits and EURange.
    expect(await form.locator('input[name="variable-tag-description"]').inputValue()).toBe('Dosing flow')
    expect(await form.locator('input[name="variable-tag-engineering-unit"]').inputValue()).toBe('L/h')
    expect(await form.locator('input[name="variable-tag-range-low"]').inputValue()).toBe('0')
    expect(await form.locator('input[name="variable-tag-range-high"]').inputValue()).toBe('250')
    const unitSelect = form.locator('select[name="variable-tag-unit"]')
    await unitSelect.selectOption((await unitSelect.locator('option', { hasText: 'T-400' }).first().getAttribute('value'))!)
    // The workbench's contract refuses a code that is not ISA-5.1 style, naming the field.
    await form.locator('input[name="variable-tag-code"]').fill('dosing flow')
    await form.getByRole('button', { name: 'Create tag and read it' }).click()
    await expect.poll(() => form.getByRole('alert').textContent()).toMatch(/tag\.code: must be an ISA-5\.1 style code/)
    await screenshot(page, 'opcua-picker-tag-refused')
    await form.locator('input[name="variable-tag-code"]').fill('FI-712')
    await form.getByRole('button', { name: 'Create tag and read it' }).click()
    await page.getByRole('status').filter({ hasText: 'Tag FI-712 created' }).waitFor()
    await expect.poll(() => page.getByRole('table', { name: 'Node table' }).getByRole('row').count()).toBe(3)

    // Each new node table restarts the collector, which subscribes again: a variable's current
    // value is its first report (IEC 62541-4 §5.12.1.4 [from memory]), so once both current values
    // are stored, the subscription holds both variables and every later change arrives.
    for (const code of ['PI-711', 'FI-712']) {
      await eventually(`the current value of ${code}`, async () => ((await storedValues(code)).length > 0 ? true : undefined))
    }
    // The plant moves; every value arrives under the tag it was mapped to.
    const t0 = Date.now() - 60_000
    for (let k = 0; k < 5; k++) {
      plant.publish('PI-701', 6 + k / 10, t0 + 1000 * k)
      plant.publish('FI-702', 120 + k, t0 + 1000 * k)
    }
    for (const [code, first] of [['PI-711', 6], ['FI-712', 120]] as const) {
      const rows = await eventually(`values of ${code}`, async () => {
        const got = await storedValues(code)
        return got.length >= 6 ? got : undefined
      })
      expect(rows.slice(-5).map(r => r.time.getTime())).toEqual([0, 1, 2, 3, 4].map(k => t0 + 1000 * k))
      expect(rows.at(-5)!.value).toBeCloseTo(first, 9)
    }
    // The status columns follow by themselves (the page reads them again every few seconds).
    await expect.poll(() => row.textContent(), { timeout: 60_000 }).toMatch(/connected/)
    await expect.poll(async () => Number((await row.getByTestId('accepted-count').textContent())?.replace(/,/g, '')), { timeout: 60_000 })
      .toBeGreaterThanOrEqual(12)
    await screenshot(page, 'opcua-picker-values-arrived')

    const audit = await sql`select action, target from audit_log where action like 'opcua.%' or action = 'tag.create' order by id`
    expect(audit.map(a => a.action)).toEqual(['opcua.connection.create', 'opcua.mappings.replace', 'tag.create', 'opcua.mapping.add'])
  })
})
