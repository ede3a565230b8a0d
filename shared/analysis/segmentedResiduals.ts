// Causal detrending that restarts after steps (docs/science.md §S2.2, §S3.3): a trip, reset,
// setpoint or mode change puts a jump into the data that would dominate variance and AR1 for a
// whole window and read as slowing down. A step is a run of residuals far outside the recent
// noise, all on one side; the trend filter then starts again at the step, and samples within one
// detrending bandwidth of any start (the record's or a step's) are warm-up: a local line fitted
// to a few points follows them too closely, and their shrunken residuals would manufacture a
// rising variance on trend-free data.
import { CausalTrendFilter } from './causalTrend'

export interface SegmentedResiduals {
  residuals: Float64Array
  /** Index of the first usable residual (after warm-up) of the segment each sample belongs to. */
  usableFrom: Int32Array
  /** Indices at which a step was detected (the first sample of the new level). */
  steps: number[]
}

export interface StepRule {
  /** A residual beyond this many recent noise SDs is out of line. */
  threshold: number
  /** Consecutive out-of-line residuals of one sign that make a step, not an outlier. */
  confirm: number
}

/**
 * 6 SD: a Gaussian residual passes it with probability 2·10⁻⁹, so five in a row on one side
 * do not come from the noise even when the residuals are strongly autocorrelated; a trip moves
 * the level by many times that [common practice].
 */
export const DEFAULT_STEP_RULE: StepRule = { threshold: 6, confirm: 5 }

/** Residuals of the one-sided local-linear trend (bandwidth in s), restarted after each step. */
export function segmentedResiduals(
  times: ArrayLike<number>, values: ArrayLike<number>, bandwidthS: number, rule: StepRule = DEFAULT_STEP_RULE,
): SegmentedResiduals {
  const n = values.length
  const residuals = new Float64Array(n)
  const usableFrom = new Int32Array(n)
  const steps: number[] = []
  let segment = startSegment(0)
  let run = 0
  let runSign = 0
  for (let i = 0; i < n; i++) {
    residuals[i] = values[i]! - segment.filter.push(times[i]!, values[i]!)
    usableFrom[i] = segment.usableFrom
    const warm = times[i]! - times[segment.start]! >= bandwidthS
    const sd = Math.sqrt(segment.meanSquare)
    const out = warm && sd > 0 && Math.abs(residuals[i]!) > rule.threshold * sd
    const sign = Math.sign(residuals[i]!)
    if (out && (run === 0 || sign === runSign)) {
      run++
      runSign = sign
    }
    else run = out ? 1 : 0
    if (run >= rule.confirm) {
      const stepAt = i - rule.confirm + 1
      steps.push(stepAt)
      segment = startSegment(stepAt)
      run = 0
      for (let j = stepAt; j <= i; j++) {
        residuals[j] = values[j]! - segment.filter.push(times[j]!, values[j]!)
        usableFrom[j] = segment.usableFrom
      }
      continue
    }
    // Out-of-line residuals do not feed the noise scale, so a step cannot hide by inflating it.
    if (!out) segment.addSquare(residuals[i]!, i - segment.start)
  }
  return { residuals, usableFrom, steps }

  function startSegment(start: number) {
    let end = start
    while (end < n && times[end]! - times[start]! < bandwidthS) end++
    const state = {
      start,
      usableFrom: end,
      filter: new CausalTrendFilter(bandwidthS),
      meanSquare: 0,
      // Exponentially weighted over about one bandwidth of samples, plain mean while warming.
      addSquare(r: number, age: number) {
        const weight = Math.max(1 / (age + 1), 1 / Math.max(end - start, 1))
        state.meanSquare += weight * (r * r - state.meanSquare)
      },
    }
    return state
  }
}
