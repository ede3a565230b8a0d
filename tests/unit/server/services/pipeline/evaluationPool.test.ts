import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, describe, expect, it } from 'vitest'
import type { RecordInput } from '#shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings } from '#shared/pipeline/indicatorDefaults'
import { inlineEvaluationPool, threadedEvaluationPool } from '../../../../../server/services/pipeline/evaluationPool'

// The real worker entry, loaded by the threads through tsx as the built server loads its bundle.
const workerFile = fileURLToPath(new URL('../../../../../server/workers/evaluateRecordWorker.ts', import.meta.url))

/** Seeded 1 Hz AR(1) record whose last sample reaches an evaluation (φ = 0.9). */
function record(tagId: number, samples: number, seed: number): RecordInput {
  const settings = defaultIndicatorSettings(1)
  const times = new Float64Array(samples)
  const values = new Float64Array(samples)
  let state = seed
  const uniform = () => ((state = (state * 1_103_515_245 + 12_345) % 2_147_483_648) + 1) / 2_147_483_649
  let x = 0
  for (let i = 0; i < samples; i++) {
    x = 0.9 * x + Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
    times[i] = 1_900_000_000 + i
    values[i] = 50 + x
  }
  return { tagId, times, values, firstNew: samples - 10, samplesSinceEvaluation: settings.evaluateEvery - 1, samplePeriodS: 1, settings }
}

describe('evaluation pool', () => {
  const threaded = threadedEvaluationPool(workerFile, 2, ['--import', 'tsx'])
  afterAll(() => threaded.close())

  it('gives on worker threads exactly what the inline path gives, in input order', async () => {
    // Long records go to the threads; the 20-sample one stays inline (shorter than a window).
    const inputs = [record(1, 1500, 11), record(2, 20, 12), record(3, 1500, 13), record(4, 900, 14)]
    const inline = await inlineEvaluationPool().evaluate(inputs)
    const onThreads = await threaded.evaluate(inputs)
    expect(onThreads).toStrictEqual(inline)
    expect(onThreads.map(r => r.points.length)).toEqual([1, 1, 1, 1])
    expect(inline[0]!.points[0]!.ar1).not.toBeNull()
  }, 60_000)

  it('leaves the caller its sample arrays (moves copies to the threads)', async () => {
    const input = record(5, 1500, 15)
    await threaded.evaluate([input])
    expect(input.times.length).toBe(1500)
    expect(input.values[1499]).toBeCloseTo(record(5, 1500, 15).values[1499]!, 12)
  }, 60_000)

  it('rejects with the error a thread threw, so the tick retries the batch tag by tag', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'brinkline-worker-'))
    const throwing = join(dir, 'throwing.mjs')
    writeFileSync(throwing, `export default () => { throw new RangeError('bad record') }`)
    const pool = threadedEvaluationPool(throwing, 1)
    try {
      await expect(pool.evaluate([record(6, 1500, 16)])).rejects.toThrow('bad record')
    }
    finally {
      await pool.close()
      rmSync(dir, { recursive: true, force: true })
    }
  }, 60_000)
})
