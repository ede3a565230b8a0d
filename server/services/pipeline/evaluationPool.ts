import { Piscina } from 'piscina'
// Relative, not '#shared': the pipeline bench loads this file through tsx, which has no aliases.
import { evaluateRecord, type RecordInput } from '../../../shared/pipeline/evaluateRecord'

export type RecordEvaluation = ReturnType<typeof evaluateRecord>

/** Evaluates a batch's records, in their order. */
export interface EvaluationPool {
  /** 0 when records are evaluated inline on the calling thread. */
  readonly threads: number
  evaluate(inputs: RecordInput[]): Promise<RecordEvaluation[]>
  close(): Promise<void>
}

/** The synchronous path: BRINKLINE_EVAL_THREADS=0, or no worker file to load. */
export function inlineEvaluationPool(): EvaluationPool {
  return {
    threads: 0,
    evaluate: async inputs => inputs.map(input => evaluateRecord(input)),
    close: async () => {},
  }
}

/**
 * Evaluations spread over worker threads, so a tick's pure computation uses every core instead
 * of queueing on the main thread (which also serves HTTP and talks to the database).
 * `workerFile` is a module whose default export calls evaluateRecord (server/workers/).
 */
export function threadedEvaluationPool(workerFile: string, threads: number, execArgv?: string[]): EvaluationPool {
  // min = max: the threads stay up between ticks instead of reloading the engine every 10 s.
  const pool = new Piscina({ filename: workerFile, minThreads: threads, maxThreads: threads, execArgv })
  return {
    threads,
    async evaluate(inputs) {
      // Post every thread task first, then do the small ones here while the threads work.
      const posted = inputs.map(input => (worthAThread(input) ? runInThread(pool, input) : null))
      return Promise.all(inputs.map((input, i) => posted[i] ?? evaluateRecord(input)))
    },
    close: () => pool.close(),
  }
}

/**
 * A record shorter than one indicator window yields no indicators and no trend tests: most
 * ticks' records are a few new samples whose history was not even loaded, because they reach no
 * evaluation (tagBatchLoad.ts). Their work takes microseconds, less than a message to a thread.
 */
function worthAThread(input: RecordInput): boolean {
  return input.values.length >= input.settings.windowSamples
}

function runInThread(pool: Piscina, input: RecordInput): Promise<RecordEvaluation> {
  // Copies moved, not cloned: one memcpy each instead of serialise + deserialise, and the
  // caller keeps its arrays (the rules and the status still read them after the evaluation).
  // The result (EvaluationPoint[], plain objects) comes back structured-cloned.
  const times = input.times.slice()
  const values = input.values.slice()
  return pool.run({ ...input, times, values }, { transferList: [times.buffer, values.buffer] })
}
