// Null records in which nothing loses stability, so every alert is false: AR(1) noise (Box &
// Jenkins 1970, Time Series Analysis, Holden-Day), and AR(1) noise with the nuisances that fool
// indicator trends — drifting means, a noise-level step, measurement noise, gaps, quantisation
// (Dakos et al. 2012 PLoS ONE 7:e41010 and 2015 Phil Trans R Soc B 370:20130263 discuss these
// [from memory]). One sample per second, as the model records.
import type { Rng } from '../../../shared/analysis/random'
import type { SampledSeries } from '../../../shared/analysis/simulate'

export interface NullKind {
  name: string
  make: (samples: number, rng: Rng) => SampledSeries
}

/** The nuisance nulls ride on this AR(1): memory of a couple of samples, like the models' starts. */
const BASE_PHI = 0.6
const baseSd = (phi: number) => 1 / Math.sqrt(1 - phi * phi)
/** Period (samples) of the slow sine and the scale of the linear drift: one short record. */
const SLOW_SCALE = 500

/** x_t = φ·x_{t−1} + s(t)·e_t with unit-variance e, started from its stationary law. */
function ar1(samples: number, phi: number, rng: Rng, innovationSd: (i: number) => number = () => 1): Float64Array {
  const out = new Float64Array(samples)
  let x = innovationSd(0) * baseSd(phi) * rng.normal()
  for (let i = 0; i < samples; i++) {
    if (i > 0) x = phi * x + innovationSd(i) * rng.normal()
    out[i] = x
  }
  return out
}

const everySecond = (samples: number) => Float64Array.from({ length: samples }, (_, i) => i)

function withMean(samples: number, rng: Rng, mean: (i: number) => number): SampledSeries {
  const values = ar1(samples, BASE_PHI, rng).map((v, i) => v + mean(i))
  return { times: everySecond(samples), values }
}

/** Drops whole blocks of 1–20 samples at random places until `fraction` of the record is gone. */
function dropBlocks(series: SampledSeries, fraction: number, rng: Rng): SampledSeries {
  const n = series.values.length
  const dropped = new Uint8Array(n)
  let count = 0
  while (count < fraction * n) {
    const start = 1 + rng.integer(n - 2)
    const length = 1 + rng.integer(20)
    // The first and last samples stay, so the record spans the same time.
    for (let i = start; i < Math.min(n - 1, start + length); i++) if (!dropped[i]) { dropped[i] = 1; count++ }
  }
  const keep = (_: number, i: number) => !dropped[i]
  return { times: series.times.filter(keep), values: series.values.filter(keep) }
}

const sd = baseSd(BASE_PHI)

export const NULL_KINDS: readonly NullKind[] = [
  ...[0.3, 0.6, 0.9].map(phi => ({
    name: `AR(1) φ=${phi}`,
    make: (samples: number, rng: Rng) => ({ times: everySecond(samples), values: ar1(samples, phi, rng) }),
  })),
  { name: 'linear drift 4 SD/500 s', make: (n, rng) => withMean(n, rng, i => 4 * sd * i / SLOW_SCALE) },
  { name: 'accelerating drift 8 SD·(t/T)³', make: (n, rng) => withMean(n, rng, i => 8 * sd * (i / n) ** 3) },
  { name: 'slow sine 2 SD, period 500 s', make: (n, rng) => withMean(n, rng, i => 2 * sd * Math.sin(2 * Math.PI * i / SLOW_SCALE)) },
  {
    // The noise amplitude doubles (variance ×4) while the memory stays: a pump change, not a loss of stability.
    name: 'noise step ×2 at mid-record',
    make: (n, rng) => ({ times: everySecond(n), values: ar1(n, BASE_PHI, rng, i => (i < n / 2 ? 1 : 2)) }),
  },
  {
    name: 'white meas. noise 0.5 SD',
    make: (n, rng) => ({ times: everySecond(n), values: ar1(n, BASE_PHI, rng).map(v => v + 0.5 * sd * rng.normal()) }),
  },
  { name: 'gaps: 5% in 1–20 s blocks', make: (n, rng) => dropBlocks({ times: everySecond(n), values: ar1(n, BASE_PHI, rng) }, 0.05, rng) },
  {
    // A quarter SD per step still passes the live quality gate (SD ≥ 2 steps, ≥ 10 levels).
    name: 'quantised to 0.25 SD',
    make: (n, rng) => ({ times: everySecond(n), values: ar1(n, BASE_PHI, rng).map(v => Math.round(v / (0.25 * sd)) * 0.25 * sd) }),
  },
]
