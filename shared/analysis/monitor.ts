// Runs the live early-warning procedure over a recorded series, exactly as the scheduled task
// would have evaluated it sample by sample: for replays, whole-procedure calibration and the
// detection benchmark.
import { causalLocalLinearTrend } from './detrend'
import { EarlyWarningLatch, judgeTrends } from './earlyWarningDecision'
import type { EarlyWarningRule, TrendEvidence } from './earlyWarningDecision'
import type { Rng } from './random'
import type { SurrogateKind } from './surrogates'
import { surrogateTrendTest } from './trendTest'

export interface MonitorSettings {
  /** Bandwidth (s) of the causal local-linear detrending; the live path's residuals are final. */
  detrendBandwidth: number
  /** Samples per indicator window. */
  indicatorWindow: number
  /** Samples in the trailing trend window whose indicator series is tested. */
  trendWindow: number
  /** Indicator evaluations inside the trend window every `indicatorStep` samples. */
  indicatorStep: number
  /** Run the trend tests every `evaluateEvery` samples. */
  evaluateEvery: number
  surrogates: number
  surrogateKind: SurrogateKind
  rule: EarlyWarningRule
}

export interface MonitorEvent {
  time: number
  change: 'raised' | 'cleared'
}

export interface MonitorReplay {
  events: MonitorEvent[]
  /** Evidence at each evaluation. */
  evaluations: { time: number, evidence: TrendEvidence }[]
}

/** Replays the early-warning decision over a record of raw samples. */
export function monitorRecord(times: Float64Array, values: Float64Array, settings: MonitorSettings, rng: Rng): MonitorReplay {
  const trend = causalLocalLinearTrend(times, values, settings.detrendBandwidth)
  const residuals = Float64Array.from(values, (v, i) => v - trend[i]!)
  const latch = new EarlyWarningLatch(settings.rule)
  const replay: MonitorReplay = { events: [], evaluations: [] }
  for (let end = settings.trendWindow; end <= values.length; end += settings.evaluateEvery) {
    const start = end - settings.trendWindow
    const tests = surrogateTrendTest(times.subarray(start, end), residuals.subarray(start, end), {
      window: { kind: 'count', samples: settings.indicatorWindow },
      step: settings.indicatorStep,
      surrogates: settings.surrogates,
      kind: settings.surrogateKind,
      indicators: ['ar1', 'variance'],
    }, rng)
    const evidence = judgeTrends(tests.ar1!, tests.variance!, settings.rule)
    const time = times[end - 1]!
    replay.evaluations.push({ time, evidence })
    const change = latch.update(evidence)
    if (change) replay.events.push({ time, change })
  }
  return replay
}
