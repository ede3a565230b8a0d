// Runs both procedures over one record and keeps only what the tables need, so the series
// itself (up to 10⁴ samples) can be dropped straight away.
import { defaultIndicatorSettings } from '../../../shared/pipeline/indicatorDefaults'
import { createRng } from '../../../shared/analysis/random'
import { dakosFold, type DakosFold } from './dakosFold'
import { runDakosOnline, type OnlineOutcome } from './dakosOnline'
import { DAKOS_ALPHA, dakosTrendTest, type DakosTrend } from './dakosTrend'
import { runLive, type LiveOutcome } from './liveProcedure'
import type { RecordMeta, StudyRecord } from './recordSets'

/** The product's α: what the live stability-trend test is judged at. */
/** The live α, so the Dakos column at the product's α compares like with like. */
export const PRODUCT_ALPHA = defaultIndicatorSettings(1).alpha
export const ONLINE_ALPHAS = [DAKOS_ALPHA, PRODUCT_ALPHA] as const

export interface ProcedureBudget {
  /** Surrogates of the baseline's whole-record trend test. */
  surrogates: number
  /** Parametric-bootstrap replicates of the baseline's fold band. */
  bootstraps: number
}

export interface RecordOutcome {
  meta: RecordMeta
  live: LiveOutcome
  dakos: DakosTrend
  dakosFold: DakosFold
  /** The baseline as a monitor: long records only. */
  online: OnlineOutcome | null
}

export function scoreRecord(record: StudyRecord, budget: ProcedureBudget): RecordOutcome {
  const { series, ...meta } = record
  const rng = createRng(Math.imul(record.id, 0x2545F491) >>> 0)
  return {
    meta,
    live: runLive(series, record.id),
    dakos: dakosTrendTest(series.times, series.values, budget.surrogates, rng),
    dakosFold: dakosFold(series.times, series.values, budget.bootstraps, rng),
    online: record.length === 'long' ? runDakosOnline(series, ONLINE_ALPHAS, record.id) : null,
  }
}
