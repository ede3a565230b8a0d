import { availableParallelism } from 'node:os'

/** Environment variable that sets how many worker threads evaluate tags; 0 evaluates inline. */
export const EVALUATION_THREADS_ENV = 'BRINKLINE_EVAL_THREADS'

/**
 * Worker threads for tag evaluations: the setting when it is a whole number ≥ 0, else one per
 * core the process may use (at least 1). The main thread keeps the database work, which mostly
 * waits, so a thread per core leaves no core idle during a tick's evaluations.
 */
export function evaluationThreadCount(setting: string | undefined, cores = availableParallelism()): number {
  const fallback = Math.max(1, cores)
  if (setting === undefined || setting.trim() === '') return fallback
  const threads = Number(setting)
  if (Number.isInteger(threads) && threads >= 0) return threads
  console.warn(`[pipeline] ${EVALUATION_THREADS_ENV}="${setting}" is not a whole number ≥ 0; using ${fallback} threads`)
  return fallback
}
