import { createRequire } from 'node:module'
import type { Page } from 'playwright-core'
import { expect } from 'vitest'

const axePath = createRequire(import.meta.url).resolve('axe-core/axe.min.js')

export interface AxeFinding { id: string, impact: string, help: string, targets: string[] }

/** axe-core's violations of impact "serious" or "critical" on the page as it is now. */
export async function seriousA11yViolations(page: Page): Promise<AxeFinding[]> {
  await page.addScriptTag({ path: axePath })
  return page.evaluate(async () => {
    type Violation = { id: string, impact: string, help: string, nodes: Array<{ target: string[] }> }
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: Violation[] }> } }).axe
    const result = await axe.run(document, { resultTypes: ['violations'] })
    return result.violations
      .filter(v => v.impact === 'serious' || v.impact === 'critical')
      .map(v => ({ id: v.id, impact: v.impact, help: v.help, targets: v.nodes.slice(0, 5).map(n => n.target.join(' ')) }))
  })
}

/** Fails the test with axe-core's serious and critical findings on the page, printed in full. */
export async function expectAccessible(page: Page, name: string): Promise<void> {
  const findings = await seriousA11yViolations(page)
  if (findings.length) console.error(`[axe] ${name}:`, JSON.stringify(findings, null, 1))
  expect(findings, name).toEqual([])
}
