import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { seededNormal } from '../../simulators/lib/random'
import { evaluationThreadCount } from '../../server/services/pipeline/evaluationThreads'
import { testSql } from '../support/db'
import { MANUAL_TICKS_ENV } from '../support/mailbox'
import { createTestTag, ingestAll, runServerTask, waitForDemoSite } from '../support/pipeline'
import { setupBuiltServer } from '../support/server'

await setupBuiltServer(MANUAL_TICKS_ENV)
const sql = testSql()
afterAll(() => sql.end())
beforeAll(() => waitForDemoSite(sql))

// The built server must find its bundled worker file (.output/server/workers/): without it the
// pool falls back to the main thread and reports 0 threads, which this test catches.
describe('tag evaluations in the built server', () => {
  it('run on the worker threads BRINKLINE_EVAL_THREADS asks for (one per core by default)', async () => {
    const id = await createTestTag(sql, 'TI-981', 'T-400', 1)
    const normal = seededNormal(981)
    let x = 0
    const start = Date.UTC(2026, 0, 5)
    const samples = Array.from({ length: 1500 }, (_, i) => {
      x = 0.9 * x + normal()
      return { tag: 'TI-981', time: new Date(start + i * 1000).toISOString(), value: 50 + x }
    })
    await ingestAll(samples)
    const report = await runServerTask('indicators:refresh')
    expect(report.evaluationThreads).toBe(evaluationThreadCount(process.env.BRINKLINE_EVAL_THREADS))
    expect(report.evaluations).toBeGreaterThan(0)
    const [points] = await sql`select count(*)::int as n, count(ar1)::int as indicators from indicator_points where tag_id = ${id}`
    expect(points!.n).toBe(report.evaluations)
    expect(points!.indicators).toBeGreaterThan(0)
  })
})
