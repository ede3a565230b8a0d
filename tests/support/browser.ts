import { mkdtempSync, mkdirSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import type postgres from 'postgres'
import { afterAll, beforeAll } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import type { Role } from '../../shared/utils/roles'
import { waitForDemoSite } from './pipeline'
import { DEMO_PASSWORD, demoEmail } from './session'

const SCREENSHOTS = join(process.env.TEST_OUTPUT_DIR ?? 'test-output', 'screenshots')

// Debian's Chromium with the flags this closed network needs (no background connections).
// Waits are generous: on a loaded 2-core machine the first page of a file (a cold Chromium and a
// cold server) took over Playwright's 30 s default to sign in; a test still ends at its own limit.
const ACTION_TIMEOUT_MS = 90_000

export async function launchChromium(): Promise<BrowserContext> {
  const context = await chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), 'brinkline-chromium-')), {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1440, height: 900 },
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
      '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  context.setDefaultTimeout(ACTION_TIMEOUT_MS)
  context.setDefaultNavigationTimeout(ACTION_TIMEOUT_MS)
  return context
}

/**
 * The file's Chromium for pages of the seeded demo site: launched once the demo site is there and
 * closed after the file, together with the file's database client `sql`. Call at the top of a spec.
 */
export function chromiumOnDemoSite(sql: postgres.Sql): { newPage: () => Promise<Page> } {
  let context: BrowserContext | undefined
  beforeAll(async () => {
    await waitForDemoSite(sql)
    context = await launchChromium()
  })
  afterAll(async () => {
    await context?.close()
    await sql.end()
  })
  return { newPage: () => context!.newPage() }
}

export async function signInThroughForm(page: Page, role: Role): Promise<void> {
  await page.goto(url('/sign-in'))
  await waitForHydration(page)
  await page.getByLabel('E-mail').fill(demoEmail(role))
  await page.getByLabel('Password').fill(DEMO_PASSWORD)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.getByTestId('signed-in-as').waitFor()
}

/**
 * Resolves once Nuxt has hydrated the page. A control set before that is lost: hydration's v-model
 * sets the server-rendered value back (a select picked on a busy machine stayed on its first tag).
 */
export async function waitForHydration(page: Page): Promise<void> {
  await page.waitForFunction(() => {
    const root = document.getElementById('__nuxt') as (HTMLElement & { __vue_app__?: { $nuxt?: { isHydrating?: boolean } } }) | null
    return root?.__vue_app__?.$nuxt?.isHydrating === false
  })
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOTS, { recursive: true })
  const path = join(SCREENSHOTS, `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}
