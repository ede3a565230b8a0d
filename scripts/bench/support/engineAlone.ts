// The evaluation pool of the built server (server/services/pipeline/evaluationPool.ts with the worker file the
// build made) over in-memory records, no database: the ceiling the tick's evaluations approach.
import { join } from 'node:path'
import type { RecordInput } from '../../../shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings } from '../../../shared/pipeline/indicatorDefaults'
import { inlineEvaluationPool, threadedEvaluationPool, type EvaluationPool } from '../../../server/services/pipeline/evaluationPool'
import { evaluationThreadCount } from '../../../server/services/pipeline/evaluationThreads'
import { ROOT } from './stack'

export interface EngineRate {
  threads: number
  evaluations: number
  ms: number
}

/** `tags` 1 Hz AR(1) records of `samples` samples, each reaching one evaluation at its end. */
function records(tags: number, samples: number): RecordInput[] {
  const settings = defaultIndicatorSettings(1)
  const phi = Math.exp(-0.05)
  return Array.from({ length: tags }, (_, tag) => {
    const times = new Float64Array(samples)
    const values = new Float64Array(samples)
    let x = 0
    for (let i = 0; i < samples; i++) {
      x = phi * x + Math.sqrt(1 - phi * phi) * Math.sqrt(-2 * Math.log(Math.random() || 1e-12)) * Math.cos(2 * Math.PI * Math.random())
      times[i] = 1_924_992_000 + i
      values[i] = 50 + x
    }
    return {
      tagId: tag + 1, times, values, firstNew: samples - 10, samplesSinceEvaluation: settings.evaluateEvery - 1, samplePeriodS: 1, settings
    }
  })
}

async function timed(pool: EvaluationPool, inputs: RecordInput[]): Promise<EngineRate> {
  // Warm-up: thread start-up and JIT are paid once per server, not per tick.
  await pool.evaluate(inputs.slice(0, 20))
  const start = performance.now()
  const results = await pool.evaluate(inputs)
  const ms = performance.now() - start
  await pool.close()
  return { threads: pool.threads, evaluations: results.reduce((n, r) => n + r.points.length, 0), ms }
}

/** Main thread, then the server's default thread count, over the same records. */
export async function engineAlone(tags: number, samples: number): Promise<EngineRate[]> {
  const inputs = records(tags, samples)
  const workerFile = join(ROOT, '.output/server/workers/evaluate-record.mjs')
  return [
    await timed(inlineEvaluationPool(), inputs),
    await timed(threadedEvaluationPool(workerFile, evaluationThreadCount(undefined)), inputs),
  ]
}
