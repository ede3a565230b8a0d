// Trend removal before the indicators (docs/science.md §S2.2): residual = value − trend.
import { CausalTrendFilter } from './causalTrend'
import { gaussianSmooth } from './gaussianSmoother'
import type { DetrendSpec } from './types'

export interface Detrended {
  trend: Float64Array
  residuals: Float64Array
}

/** Removes the trend named by `spec` from a record. */
export function detrend(times: ArrayLike<number>, values: ArrayLike<number>, spec: DetrendSpec): Detrended {
  const trend = trendOf(times, values, spec)
  const residuals = new Float64Array(values.length)
  for (let i = 0; i < values.length; i++) residuals[i] = values[i]! - trend[i]!
  return { trend, residuals }
}

function trendOf(times: ArrayLike<number>, values: ArrayLike<number>, spec: DetrendSpec): Float64Array {
  switch (spec.kind) {
    case 'none': return new Float64Array(values.length)
    case 'linear': return linearTrend(times, values)
    case 'gaussian': return gaussianSmooth(times, values, spec.bandwidth)
    case 'localLinear': return causalLocalLinearTrend(times, values, spec.bandwidth)
  }
}

/** Ordinary least-squares straight line through the record, evaluated at each time. */
export function linearTrend(times: ArrayLike<number>, values: ArrayLike<number>): Float64Array {
  const n = values.length
  let tMean = 0
  let yMean = 0
  for (let i = 0; i < n; i++) {
    tMean += times[i]!
    yMean += values[i]!
  }
  tMean /= n
  yMean /= n
  let stt = 0
  let sty = 0
  for (let i = 0; i < n; i++) {
    const dt = times[i]! - tMean
    stt += dt * dt
    sty += dt * (values[i]! - yMean)
  }
  const slope = stt > 0 ? sty / stt : 0
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) out[i] = yMean + slope * (times[i]! - tMean)
  return out
}

/** The one-sided local-linear trend of a whole record (see CausalTrendFilter). */
export function causalLocalLinearTrend(times: ArrayLike<number>, values: ArrayLike<number>, bandwidth: number): Float64Array {
  const filter = new CausalTrendFilter(bandwidth)
  const out = new Float64Array(values.length)
  for (let i = 0; i < values.length; i++) out[i] = filter.push(times[i]!, values[i]!)
  return out
}
