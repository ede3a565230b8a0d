// The published pipeline used as a monitor, for the online rates: re-run at live evaluation
// instants on the latest trend window of the live settings (so both procedures judge the same
// samples), raising on each decision whose AR1 trend p ≤ α follows one that was not. The
// published pipeline has no on-delay and none is added. It decides at every third live evaluation
// (the span of the live on-delay), for CPU: each decision costs 99 surrogate runs. It starts once
// a full trend window is there, while the live procedure judges from its minimum trend length.
import { createRng } from '../../../shared/analysis/random'
import type { SampledSeries } from '../../../shared/analysis/simulate'
import { defaultIndicatorSettings } from '../../../shared/pipeline/indicatorDefaults'
import { dakosTrendTest } from './dakosTrend'
import { SAMPLE_PERIOD_S } from './liveProcedure'

const DECISION_EVERY_EVALUATIONS = 3

export interface OnlineAlerts {
  alerts: number[]
  activeAtEnd: boolean
}

export interface OnlineOutcome {
  /** Keyed by α: the published 0.05 and the product's. */
  byAlpha: Map<number, OnlineAlerts>
  decisions: number
}

export function runDakosOnline(series: SampledSeries, alphas: readonly number[], seed: number): OnlineOutcome {
  const settings = defaultIndicatorSettings(SAMPLE_PERIOD_S)
  const window = settings.trendWindowSamples
  const rng = createRng(seed)
  const byAlpha = new Map(alphas.map(alpha => [alpha, { alerts: [] as number[], activeAtEnd: false }]))
  let decisions = 0
  // Instants of evaluateRecord's evaluations (every evaluateEvery-th sample), every third one.
  const every = DECISION_EVERY_EVALUATIONS * settings.evaluateEvery
  for (let end = every - 1; end < series.values.length; end += every) {
    if (end + 1 < window) continue
    const start = end + 1 - window
    const trend = dakosTrendTest(
      series.times.subarray(start, end + 1), series.values.subarray(start, end + 1), settings.surrogates, rng, false)
    decisions++
    for (const [alpha, state] of byAlpha) {
      const evidence = trend.pAr1 <= alpha
      if (evidence && !state.activeAtEnd) state.alerts.push(series.times[end]!)
      state.activeAtEnd = evidence
    }
  }
  return { byAlpha, decisions }
}
