// Whole-procedure calibration (docs/science.md §S8.1): re-testing a growing series every tick
// makes "p < α once" far likelier than α, so the false-alarm rate is measured on the complete
// live procedure (detrending, trend tests, on-delay) run over null series, per tag-week.
import type { Rng } from './random'
import type { SampledSeries } from './simulate'

export interface FalseAlarmEstimate {
  runs: number
  /** Alarm activations over all runs. */
  alarms: number
  /** Monitored duration over all runs, seconds. */
  seconds: number
  perTagWeek: number
  /** One-sided 95% upper bound on the rate per tag-week (Poisson; exact for 0 alarms: −ln 0.05 ≈ 3). */
  upper95PerTagWeek: number
}

const WEEK = 7 * 24 * 3600

/**
 * Runs `countAlarms` (the procedure) over `runs` series drawn from `simulateNull` and returns the
 * false-alarm rate per tag-week. The Poisson upper bound uses the Wilson–Hilferty approximation to
 * the χ² quantile (accurate to ~1% for counts ≥ 1 [from memory]).
 */
export function procedureFalseAlarmRate(
  runs: number,
  simulateNull: (rng: Rng) => SampledSeries,
  countAlarms: (series: SampledSeries, rng: Rng) => number,
  rng: Rng,
): FalseAlarmEstimate {
  let alarms = 0
  let seconds = 0
  for (let r = 0; r < runs; r++) {
    const series = simulateNull(rng)
    alarms += countAlarms(series, rng)
    seconds += series.times[series.times.length - 1]! - series.times[0]!
  }
  const weeks = seconds / WEEK
  return { runs, alarms, seconds, perTagWeek: alarms / weeks, upper95PerTagWeek: poissonUpper95(alarms) / weeks }
}

/** One-sided 95% upper confidence limit of a Poisson mean after observing `count` events. */
export function poissonUpper95(count: number): number {
  if (count === 0) return -Math.log(0.05)
  // χ²_{0.95}(2(count+1))/2 via Wilson–Hilferty, z = 1.6448536.
  const k = 2 * (count + 1)
  const z = 1.6448536269514722
  return (k * (1 - 2 / (9 * k) + z * Math.sqrt(2 / (9 * k))) ** 3) / 2
}
