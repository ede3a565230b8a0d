// The baseline's time-to-tip: the recovery rate λ = −ln(r₁)/Δt of rolling windows of 20% of the
// record, λ² regressed on time over the last half (near a fold driven linearly in time λ² falls
// linearly to zero: Wissel 1984, Oecologia 65:101–107; Dakos et al. 2008 PNAS 105:14308 and
// Scheffer et al. 2009 Nature 461:53 for the idea [from memory]), extrapolated to its zero
// crossing. The band is a parametric bootstrap: AR(1) series redrawn from the fitted φ(t) path,
// re-estimated the same way. A projection is given whenever the fitted line falls and crosses zero
// after the last sample, as in the published method; it has no significance gate of its own (an
// earlier version of this baseline asked 95% of the bootstrap lines to fall, which no published
// pipeline does, and then projected on almost no approach), so it also projects on many nulls.
import type { Rng } from '../../../shared/analysis/random'
import { dakosResiduals } from './dakosTrend'
import { rollingAr1AndVariance } from './rollingIndicators'
import { quantile } from './stats'

export const FOLD_WINDOW_FRACTION = 0.2
/** Two-sided coverage of the band, the live fold horizon's. */
export const FOLD_BAND = 0.9
/** φ is capped here in the bootstrap: the fitted line may reach λ² ≤ 0 inside the stretch. */
const MAX_PHI = 0.999

export type DakosFold =
  | { kind: 'projected', tip: number, low: number, high: number }
  | { kind: 'none', reason: string }

interface Line { tMean: number, a: number, b: number }

/**
 * λ̂² of every window whose centre lies in the record's last half, against the centre time.
 * `values[from …]` is the stretch those windows cover; Δt is the record's mean spacing (gaps are
 * ignored, as in the trend test).
 */
function rateSquaredPoints(times: Float64Array, values: Float64Array, from: number, dt: number): { t: number[], y: number[] } {
  const n = times.length
  const window = Math.round(FOLD_WINDOW_FRACTION * n)
  const halfway = (times[0]! + times[n - 1]!) / 2
  const { ar1 } = rollingAr1AndVariance(values.subarray(from), window)
  const t: number[] = []
  const y: number[] = []
  ar1.forEach((r1, k) => {
    const centre = (times[from + k]! + times[from + k + window - 1]!) / 2
    if (centre < halfway || !(r1 > 0 && r1 < 1)) return
    const rate = -Math.log(r1) / dt
    t.push(centre)
    y.push(rate * rate)
  })
  return { t, y }
}

function leastSquares(t: readonly number[], y: readonly number[]): Line {
  const n = t.length
  const tMean = t.reduce((s, v) => s + v, 0) / n
  const a = y.reduce((s, v) => s + v, 0) / n
  let stt = 0, sty = 0
  for (let i = 0; i < n; i++) { stt += (t[i]! - tMean) ** 2; sty += (t[i]! - tMean) * (y[i]! - a) }
  return { tMean, a, b: sty / stt }
}

const zeroCrossing = (line: Line) => (line.b < 0 ? line.tMean - line.a / line.b : Number.POSITIVE_INFINITY)

/** First sample of the earliest window whose centre can fall in the last half. */
function stretchStart(times: Float64Array): number {
  const n = times.length
  const window = Math.round(FOLD_WINDOW_FRACTION * n)
  const halfway = (times[0]! + times[n - 1]!) / 2
  let first = 0
  while (first + window < n && (times[first]! + times[first + window - 1]!) / 2 < halfway) first++
  return first
}

/** An AR(1) stretch with φ_i = exp(−Δt·√λ²(t_i)) from the fitted line, unit stationary variance. */
function redraw(times: Float64Array, from: number, line: Line, dt: number, rng: Rng): Float64Array {
  const out = new Float64Array(times.length)
  let x = rng.normal()
  for (let i = from; i < times.length; i++) {
    const rateSquared = line.a + line.b * (times[i]! - line.tMean)
    const phi = rateSquared > 0 ? Math.min(MAX_PHI, Math.exp(-dt * Math.sqrt(rateSquared))) : MAX_PHI
    x = phi * x + Math.sqrt(1 - phi * phi) * rng.normal()
    out[i] = x
  }
  return out
}

export function dakosFold(times: Float64Array, values: Float64Array, bootstraps: number, rng: Rng): DakosFold {
  const n = values.length
  const residuals = dakosResiduals(times, values)
  const from = stretchStart(times)
  const last = times[n - 1]!
  const dt = (last - times[0]!) / (n - 1)
  const points = rateSquaredPoints(times, residuals, from, dt)
  if (points.t.length < 3) return { kind: 'none', reason: 'fewer than 3 windows with 0 < r₁ < 1' }
  const line = leastSquares(points.t, points.y)
  const tip = zeroCrossing(line)
  if (!(tip > last)) return { kind: 'none', reason: line.b < 0 ? 'line reached zero before the last sample' : 'λ² not falling' }
  // The bootstrap leaves out the kernel detrending (its effect on r₁ at a 10% bandwidth is small,
  // and smoothing every replicate would cost O(n²)).
  const tips: number[] = []
  for (let k = 0; k < bootstraps; k++) {
    const replicate = rateSquaredPoints(times, redraw(times, from, line, dt, rng), from, dt)
    const refit = replicate.t.length >= 3 ? leastSquares(replicate.t, replicate.y) : { tMean: 0, a: 0, b: 0 }
    // A replicate whose line does not fall never reaches zero: its tip is at infinity, which
    // widens the band's upper end as it should.
    tips.push(zeroCrossing(refit))
  }
  tips.sort((a, b) => a - b)
  return { kind: 'projected', tip, low: quantile(tips, (1 - FOLD_BAND) / 2), high: quantile(tips, (1 + FOLD_BAND) / 2) }
}
