// Entry of the evaluation worker threads (server/services/pipeline/evaluationPool.ts). The build bundles it
// into a file of its own (workerChunkPlugin.ts), since a worker thread loads its code from disk.
// Relative imports only: esbuild there and tsx in the tests resolve no '#shared' alias.
import { evaluateRecord, type RecordInput } from '../../shared/pipeline/evaluateRecord'

// No stage timer: a StageClock cannot be shared across threads, so the caller times the whole.
export default function evaluateRecordInWorker(input: RecordInput): ReturnType<typeof evaluateRecord> {
  return evaluateRecord(input)
}
