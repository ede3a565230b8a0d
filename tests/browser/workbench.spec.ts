import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { expectAccessible } from '../support/axe'
import { chromiumOnDemoSite, screenshot, signInThroughForm } from '../support/browser'
import { testSql } from '../support/db'
import { busToCollapse, FIXED_START_MS } from '../support/demoPlant'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { ingestAll } from '../support/pipeline'
import { typedPlantTime } from '../support/plantTime'
import { setupBuiltServer } from '../support/server'

// The engineer's workbench journey (issue 14): a new tag on a demo unit, its indicator settings
// tuned with the now-vs-proposed preview and saved as a version, an alarm rule written with its
// ISA-18.2 rationale, and a replay of the tag's history with the collapse marked as the event.
await setupBuiltServer({ ...MANUAL_TICKS_ENV, BRINKLINE_REPLAY_WORKER: '1' })
const sql = testSql()
const browser = chromiumOnDemoSite(sql)

const CODE = 'EI-381'
const DESCRIPTION = 'Load-bus voltage, second transmitter'

describe('engineer tunes a new tag on the workbench', () => {
  it('creates a tag, previews and saves its settings, writes a rule with rationale and replays its history', async () => {
    const page = await browser.newPage()
    await signInThroughForm(page, 'engineer')
    await page.goto(url('/workbench'))
    await page.getByRole('heading', { name: 'Workbench · plant model' }).waitFor()

    // A second voltage transmitter on the demo load bus, defined like the catalogue's EI-301.
    const [bus] = await sql`select code, name from units where code = 'B-300'`
    const tagForm = page.getByRole('form', { name: 'New tag' })
    await tagForm.getByRole('combobox', { name: /^Unit/ }).selectOption({ label: `${bus!.code} ${bus!.name}` })
    await tagForm.getByRole('textbox', { name: /^Tag code/ }).fill(CODE)
    await tagForm.getByRole('textbox', { name: /^Description/ }).fill(DESCRIPTION)
    await tagForm.getByRole('textbox', { name: /^Engineering unit/ }).fill('pu')
    await tagForm.getByRole('textbox', { name: /^Expected sample period/ }).fill('2')
    await tagForm.getByRole('textbox', { name: /^Range high/ }).fill('1.2')
    await tagForm.getByRole('textbox', { name: /^Noise floor/ }).fill('0.0005')
    await tagForm.getByRole('textbox', { name: /^Quantisation step/ }).fill('0.0001')
    await screenshot(page, 'engineer-workbench-new-tag')
    await tagForm.getByRole('button', { name: 'Create tag' }).click()
    await page.waitForURL(/\/workbench\/tags\/\d+$/)
    await page.getByRole('heading', { name: `Workbench · ${CODE} ${DESCRIPTION}` }).waitFor()
    const [stored] = await sql`select t.id, u.code as unit from tags t join units u on u.id = t.unit_id where t.code = ${CODE}`
    expect(stored!.unit).toBe('B-300')
    expect(page.url()).toMatch(new RegExp(`/workbench/tags/${stored!.id}$`))

    // History for the new tag: the demo load bus simulated until its voltage collapses, moved so
    // the collapse falls on a fixed time (the same approach as replay.spec.ts).
    const { samples, tipMs } = busToCollapse()
    const shift = FIXED_START_MS - tipMs!
    const rows = samples.filter(s => s.tag === 'EI-301' && s.time <= tipMs!).map(s => ({ tag: CODE, time: new Date(s.time + shift).toISOString(), value: s.value }))
    await ingestAll(rows)

    // Indicator settings: a stricter α per look, previewed now against proposed.
    const settings = page.getByRole('form', { name: 'Indicator settings' })
    const alpha = settings.getByRole('textbox', { name: /^α per look/ })
    const alphaNow = await alpha.inputValue()
    await alpha.fill('0.001')
    expect(alphaNow).not.toBe('0.001')
    await settings.getByRole('button', { name: 'Preview', exact: true }).click()
    const preview = page.getByTestId('settings-preview')
    await preview.waitFor({ timeout: 300_000 })
    expect(await preview.getByTestId('preview-summary').textContent()).toMatch(/\(\d+ looks, times in Europe\/London\): now \d+ of \d+ judged slowing down, proposed \d+ of \d+\./)
    const lookCount = Number(/\((\d+) looks/.exec((await preview.getByTestId('preview-summary').textContent())!)![1])
    expect(lookCount).toBeGreaterThan(0)
    // Value, variance, AR(1), recovery rate and p per look: each chart host holds a drawn canvas.
    const charts = preview.getByRole('img')
    await expect.poll(() => charts.count()).toBe(5)
    await expect.poll(() => preview.locator('[role="img"] canvas').evaluateAll(cs => cs.filter(c => (c as HTMLCanvasElement).width > 0).length)).toBeGreaterThanOrEqual(5)
    // The caption is shown in capitals; innerText applies the CSS uppercasing, so it reads what the
    // engineer sees: α must stay the Greek small letter, not Α (U+0391), which reads as a Latin A.
    const pCaption = preview.locator('figcaption').filter({ hasText: 'per look' })
    const shown = await pCaption.evaluate(el => (el as HTMLElement).innerText)
    expect(shown).toContain('STABILITY-TREND P PER LOOK')
    expect(shown).toContain('BELOW α: SLOWING DOWN')
    expect(shown).not.toContain('\u0391')
    await expectAccessible(page, 'workbench tag page with the settings preview')
    await screenshot(page, 'engineer-workbench-settings-preview')

    await settings.getByRole('textbox', { name: /^Reason for the change/ }).fill('fewer looks judged slowing down on the spare transmitter')
    await settings.getByRole('button', { name: 'Save settings' }).click()
    await settings.getByRole('status').filter({ hasText: 'Saved as a new settings version' }).waitFor()
    const inForce = page.getByRole('table', { name: 'Settings versions' }).locator('tbody tr').filter({ hasText: '(in force)' })
    await expect.poll(() => inForce.textContent()).toContain('fewer looks judged slowing down on the spare transmitter')
    expect(await inForce.locator('td').nth(5).textContent()).toBe('0.001')
    expect(await alpha.inputValue()).toBe('0.001')

    // An alarm rule: refused without its rationale, the message naming the missing field.
    const ruleForm = page.getByRole('form', { name: 'New rule' })
    await ruleForm.getByRole('textbox', { name: /^Rule name/ }).fill(`Bus voltage low (${CODE})`)
    await ruleForm.getByRole('combobox', { name: /^Measure/ }).selectOption('value')
    await ruleForm.getByRole('combobox', { name: /^Comparison/ }).selectOption('below')
    // Demo settings: a limit below where this simulated bus runs in normal operation, with a
    // deadband so a value hovering at the limit does not chatter (ISA-18.2 deadband).
    await ruleForm.getByRole('textbox', { name: /^Threshold/ }).fill('0.8')
    await ruleForm.getByRole('textbox', { name: /^Deadband/ }).fill('0.02')
    await ruleForm.getByRole('combobox', { name: /^Priority/ }).selectOption('high')
    await ruleForm.getByRole('button', { name: 'Create rule' }).click()
    const refusal = ruleForm.getByRole('alert')
    await refusal.waitFor()
    // ISA-18.2 rationalization: consequence, cause and operator action are documented per alarm.
    expect(await refusal.textContent()).toMatch(/consequence: /)
    expect(await refusal.textContent()).toMatch(/operatorAction: /)
    await screenshot(page, 'engineer-workbench-rule-refused')
    expect((await sql`select count(*)::int as n from alarm_rules where tag_id = ${stored!.id}`)[0]!.n).toBe(0)

    await ruleForm.getByRole('textbox', { name: /^Consequence of no action/ }).fill('The load bus may collapse and trip the feeders it supplies.')
    await ruleForm.getByRole('textbox', { name: /^Likely cause/ }).fill('Load recovering faster than the supply can follow.')
    await ruleForm.getByRole('textbox', { name: /^Operator action/ }).fill('Follow the site procedure for low bus voltage.')
    await ruleForm.getByRole('textbox', { name: /^Time to respond/ }).fill('300')
    await ruleForm.getByRole('button', { name: 'Create rule' }).click()
    await ruleForm.getByRole('status').filter({ hasText: 'Rule created.' }).waitFor()
    const ruleRow = page.getByRole('table', { name: 'Alarm rules' }).locator('tbody tr').filter({ hasText: `Bus voltage low (${CODE})` })
    await ruleRow.waitFor()
    expect(await ruleRow.textContent()).toContain('value below 0.8')
    expect(await ruleRow.textContent()).toContain('5 min')
    await screenshot(page, 'engineer-workbench-rule-created')

    // A replay of the tag's history with the collapse marked as the known event.
    await page.getByRole('link', { name: 'Plant model' }).click()
    await page.getByRole('link', { name: 'Replays' }).click()
    await page.getByRole('heading', { name: 'Workbench · replays' }).waitFor()
    const replayForm = page.getByRole('form', { name: 'New replay', exact: true })
    await replayForm.getByRole('combobox', { name: /^Tag/ }).selectOption({ label: `${CODE} — ${DESCRIPTION}` })
    await replayForm.getByRole('textbox', { name: /^From/ }).fill(typedPlantTime(Date.parse(rows[0]!.time) - 60_000))
    await replayForm.getByRole('textbox', { name: /^To \(/ }).fill(typedPlantTime(FIXED_START_MS))
    await replayForm.getByRole('textbox', { name: /^Known event/ }).fill(typedPlantTime(FIXED_START_MS))
    await replayForm.getByRole('textbox', { name: /^Warning window/ }).fill('30')
    await replayForm.getByRole('textbox', { name: /^Note/ }).fill('second transmitter, bus collapse')
    await screenshot(page, 'engineer-workbench-replay-form')
    await replayForm.getByRole('button', { name: 'Queue replay' }).click()
    await page.waitForURL(/\/workbench\/replays\/\d+$/)
    await page.getByRole('heading', { name: new RegExp(`^Replay \\d+ · ${CODE}$`) }).waitFor()
    expect(await page.getByRole('note').first().textContent()).toContain('Advisory only')
    await page.getByRole('heading', { name: 'Report' }).waitFor({ timeout: 600_000 })
    const summary = await page.getByTestId('replay-summary').textContent()
    expect(summary).toContain(`Marked event: ${typedPlantTime(FIXED_START_MS)}`)
    expect(summary).toContain('warning window 30 min')
    expect(summary).toMatch(/Earliest warning: \d+ min before the event/)
    expect(await page.getByRole('img', { name: 'Value, with what would have fired chart' }).count()).toBe(1)
    // The rule the engineer wrote is the one the replay ran.
    await expect.poll(() => page.getByRole('table', { name: 'What would have fired' }).locator('tbody tr').filter({ hasText: `Bus voltage low (${CODE})` }).count()).toBeGreaterThan(0)
    await screenshot(page, 'engineer-workbench-replay-report')
  }, 900_000)
})
