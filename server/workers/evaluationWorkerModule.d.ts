// The module workerChunkPlugin.ts makes at build time.
declare module 'brinkline:evaluation-worker' {
  /** file:// URL of server/workers/evaluateRecordWorker.ts, bundled on its own. */
  export function evaluationWorkerUrl(): string
}
