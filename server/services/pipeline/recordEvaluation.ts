// Referenced here, not left to the server tsconfig: the app's type check reaches this file too.
// eslint-disable-next-line @typescript-eslint/triple-slash-reference -- an ambient module file has no exports to import
/// <reference path="../../workers/evaluationWorkerModule.d.ts" />
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { evaluationWorkerUrl } from 'brinkline:evaluation-worker'
import type { RecordInput } from '#shared/pipeline/evaluateRecord'
import { inlineEvaluationPool, threadedEvaluationPool, type EvaluationPool, type RecordEvaluation } from './evaluationPool'
import { EVALUATION_THREADS_ENV, evaluationThreadCount } from './evaluationThreads'

let shared: EvaluationPool | null = null

/** The server's one evaluation pool, made on first use, shared by every batch of every tick. */
export function serverEvaluationPool(): EvaluationPool {
  shared ??= createServerPool()
  return shared
}

/** Evaluates a batch's records on the server's pool (worker threads unless switched off). */
export function evaluateRecords(inputs: RecordInput[]): Promise<RecordEvaluation[]> {
  return serverEvaluationPool().evaluate(inputs)
}

function createServerPool(): EvaluationPool {
  const threads = evaluationThreadCount(process.env[EVALUATION_THREADS_ENV])
  if (threads === 0) return inlineEvaluationPool()
  const workerFile = fileURLToPath(evaluationWorkerUrl())
  // A build without the worker chunk is a packaging bug, but alarms must keep coming: evaluate
  // inline and say so, rather than fail every tag of every tick.
  if (!existsSync(workerFile)) {
    console.error(`[pipeline] evaluation worker ${workerFile} is missing; evaluating on the main thread`)
    return inlineEvaluationPool()
  }
  return threadedEvaluationPool(workerFile, threads)
}
