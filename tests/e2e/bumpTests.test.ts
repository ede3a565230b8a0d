// Bump tests on the workbench: a simulated step response y = y∞ + A·e^{−k(t − t₀)} + white noise σ
// goes in through ingest; the stored fit must recover k within 4 standard errors, the SE being the
// linearised least-squares one computed from the true parameters and the known σ,
// SE(k) = σ·√[(JᵀJ)⁻¹]ₖₖ (Seber & Wild 1989, Nonlinear Regression §2.1 [from memory]).
// Step times are entered plant-local: Europe/London is UTC+1 in July (IANA tz database, Rule EU).
import { inverse, Matrix } from 'ml-matrix'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createRng } from '../../shared/analysis/random'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(() => sql.end())
let engineer = ''
let tagId = 0
const CODE = 'TT-951'
const STEP_UTC_MS = Date.UTC(2026, 6, 6, 9, 0, 0)
const K = 0.03
const A = 2
const SIGMA = 0.05
const RESPONSE_S = 300

function analyticRateSe(): number {
  const jtj = [[0, 0, 0], [0, 0, 0], [0, 0, 0]]
  for (let t = 0; t <= RESPONSE_S; t++) {
    const e = Math.exp(-K * t)
    const g = [1, e, -A * t * e]
    for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) jtj[a]![b]! += g[a]! * g[b]!
  }
  return SIGMA * Math.sqrt(inverse(new Matrix(jtj)).get(2, 2))
}

beforeAll(async () => {
  await waitForDemoSite(sql)
  engineer = await signInAs('engineer')
  const [unit] = await sql`select code from units order by id limit 1`
  tagId = await createTestTag(sql, CODE, unit!.code, 1)
  const rng = createRng(5)
  const samples = Array.from({ length: 60 + RESPONSE_S + 1 }, (_, i) => {
    const t = i - 60
    return {
      tag: CODE,
      time: new Date(STEP_UTC_MS + t * 1000).toISOString(),
      value: 50 + (t >= 0 ? A * Math.exp(-K * t) : 0) + SIGMA * rng.normal()
    }
  })
  await ingestAll(samples)
})

describe('bump tests', () => {
  it('refuses bad values naming the field, a step time a clock change skips included', async () => {
    const good = { stepTime: '2026-07-06 10:00:00', stepSize: A, responseS: RESPONSE_S }
    const cases: [Record<string, unknown>, string][] = [
      [{ stepSize: 0 }, 'stepSize'], [{ stepTime: 'yesterday' }, 'stepTime'], [{ responseS: -1 }, 'responseS'],
      // 01:30 on 29 March 2026 does not exist in Europe/London: clocks go from 01:00 to 02:00.
      [{ stepTime: '2026-03-29 01:30:00' }, 'stepTime'],
    ]
    for (const [change, field] of cases) {
      const res = await call(`/api/tags/${tagId}/bump-tests`, { method: 'POST', cookie: engineer, json: { ...good, ...change } })
      expect(res.status, field).toBe(400)
      expect(res.body.message, field).toContain(`${field}:`)
    }
    expect((await call(`/api/tags/${tagId}/bump-tests`, { method: 'POST', cookie: await signInAs('operator'), json: good })).status).toBe(403)
  })

  it('fits the recovery of a logged step and recovers the known rate within 4 SE of the noise', async () => {
    const res = await call(`/api/tags/${tagId}/bump-tests`, { method: 'POST', cookie: engineer, json: { stepTime: '2026-07-06 10:00:00', stepSize: A, responseS: RESPONSE_S, note: 'feed valve +2 %' } })
    expect(res.status).toBe(201)
    expect(new Date(res.body.stepTime).toISOString()).toBe(new Date(STEP_UTC_MS).toISOString())
    expect(res.body.fitStatus).toBe('fit')
    const se = analyticRateSe()
    expect(Math.abs(res.body.rate - K)).toBeLessThanOrEqual(4 * se)
    expect(res.body.rateSe / se).toBeGreaterThan(0.7)
    expect(res.body.rateSe / se).toBeLessThan(1.4)
    expect(res.body.residualSd).toBeGreaterThan(0.8 * SIGMA)
    expect(res.body.residualSd).toBeLessThan(1.2 * SIGMA)
    const [audit] = await sql`select detail from audit_log where action = 'bump_test.create' order by id desc limit 1`
    expect(audit!.detail.after.rate).toBe(res.body.rate)
  })

  it('waits for a response still to come, and keeps a per-tag history newest first', async () => {
    const later = await call(`/api/tags/${tagId}/bump-tests`, { method: 'POST', cookie: engineer, json: { stepTime: '2026-07-06 11:00:00', stepSize: -1, responseS: 120 } })
    expect(later.status).toBe(201)
    expect(later.body.fitStatus).toBeNull()
    const refit = await call(`/api/bump-tests/${later.body.id}/fit`, { method: 'POST', cookie: engineer })
    expect(refit.body.fitStatus).toBe('no fit')
    const list = await call(`/api/tags/${tagId}/bump-tests`, { cookie: engineer })
    expect(list.body.tag.timeZone).toBe('Europe/London')
    expect(list.body.tests.map((t: { stepSize: number }) => t.stepSize)).toEqual([-1, A])
    expect(list.body.tests[1].recordedByName).toBeTruthy()
  })
})
