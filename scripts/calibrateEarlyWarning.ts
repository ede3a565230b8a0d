// Whole-procedure calibration of the live slowing-down alert (docs/science.md §S8.1): seeded
// 500-sample records through shared/pipeline/evaluateRecord with the default settings, then the
// slowing-down rule's on-/off-delay, exactly as the scheduled task replays them. Counts the records
// that raised at least one alert, per kind. Environment overrides (ALPHA, ON, EVERY, BW, MIN,
// SEEDS, N) let a candidate setting be compared on the same seeds.
//   npx tsx scripts/calibrateEarlyWarning.ts
//
// Harvesting fold: May 1977 (Nature 269:471) grazing model dx = [x(1 − x) − h·x²/(s² + x²)]dt
// + σdW with s = 0.1, as simulated by Bury et al. 2021 (PNAS 118:e2106140118) [parameters from
// memory]; h ramps from 0.15 to the fold h_c = 0.260437 (found numerically here), the record
// stopping a uniform 0–150 time units before it; σ = 0.01, one sample per time unit.
import { createRng, type Rng } from '../shared/analysis/random'
import { evaluateRecord } from '../shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings, EARLY_WARNING_DELAYS, evaluationIntervalS } from '../shared/pipeline/indicatorDefaults'
import { ruleActivations } from '../shared/pipeline/ruleReplay'

const env = (name: string) => (process.env[name] === undefined ? undefined : Number(process.env[name]))
const N = env('N') ?? 500
const SEEDS = env('SEEDS') ?? 60
const ON_DELAY = env('ON') ?? EARLY_WARNING_DELAYS.onDelayEvaluations
const OFF_DELAY = EARLY_WARNING_DELAYS.offDelayEvaluations
const defaults = defaultIndicatorSettings(1)
const settings = {
  ...defaults,
  alpha: env('ALPHA') ?? defaults.alpha,
  evaluateEvery: env('EVERY') ?? defaults.evaluateEvery,
  detrendBandwidthS: env('BW') ?? defaults.detrendBandwidthS,
  minTrendSamples: env('MIN') ?? defaults.minTrendSamples,
  surrogates: env('SURROGATES') ?? defaults.surrogates,
}
const ONLY = process.env.ONLY

const HARVEST_FOLD = 0.260437
function harvest(rng: Rng, forced: boolean): Float64Array {
  const h0 = 0.15, sigma = 0.01, dt = 0.01, stepsPerSample = 100
  const stop = rng.uniform() * 150
  const rate = forced ? (HARVEST_FOLD - h0) / (N + stop) : 0
  const drift = (x: number, h: number) => x * (1 - x) - h * x * x / (0.01 + x * x)
  let x = 0.8
  for (let k = 0; k < 20_000; k++) x += dt * drift(x, h0)
  const out = new Float64Array(N)
  let t = 0
  for (let i = 0; i < N; i++) {
    for (let k = 0; k < stepsPerSample; k++) {
      x += dt * drift(x, h0 + rate * t) + sigma * Math.sqrt(dt) * rng.normal()
      t += dt
    }
    out[i] = x
  }
  return out
}

function ar1(rng: Rng, phi: number, options: { mean?: (i: number) => number, sd?: (i: number) => number, white?: number } = {}): Float64Array {
  const out = new Float64Array(N)
  let x = rng.normal() / Math.sqrt(1 - phi * phi)
  for (let i = 0; i < N; i++) {
    x = phi * x + (options.sd?.(i) ?? 1) * rng.normal()
    out[i] = x + (options.mean?.(i) ?? 0) + (options.white ?? 0) * rng.normal()
  }
  return out
}

const KINDS: Record<string, (rng: Rng) => Float64Array> = {
  'harvesting fold (forced)': r => harvest(r, true),
  'harvesting, fixed h': r => harvest(r, false),
  'AR(1) φ 0.3': r => ar1(r, 0.3),
  'AR(1) φ 0.6': r => ar1(r, 0.6),
  'AR(1) φ 0.9': r => ar1(r, 0.9),
  'noise step ×2': r => ar1(r, 0.6, { sd: i => (i < N / 2 ? 1 : 2) }),
  'linear drift': r => ar1(r, 0.6, { mean: i => 5 * i / N }),
  'accelerating drift': r => ar1(r, 0.6, { mean: i => 10 * (i / N) ** 3 }),
  'slow sine drift': r => ar1(r, 0.6, { mean: i => 3 * Math.sin(2 * Math.PI * i / N) }),
  'added white noise': r => ar1(r, 0.6, { white: 1 }),
}

function alerts(values: Float64Array, tagId: number): number {
  const times = Float64Array.from(values, (_, i) => i)
  const { points } = evaluateRecord({ tagId, times, values, firstNew: 0, samplesSinceEvaluation: 0, samplePeriodS: 1, settings })
  const interval = evaluationIntervalS(settings, 1)
  return ruleActivations(points, 'early_warning', {
    comparison: 'above', threshold: 0.5, deadband: 0, onDelayS: ON_DELAY * interval, offDelayS: OFF_DELAY * interval,
  }).length
}

console.log(`α ${settings.alpha}, on-delay ${ON_DELAY}, every ${settings.evaluateEvery}, bandwidth ${settings.detrendBandwidthS}, first judgement after ${settings.minTrendSamples}; ${SEEDS} records of ${N} per kind`)
Object.entries(KINDS).forEach(([name, make], k) => {
  if (ONLY && !name.includes(ONLY)) return
  let alerted = 0
  for (let s = 0; s < SEEDS; s++) if (alerts(make(createRng(1_000 * s + 17 * k + 13)), s + 1) > 0) alerted++
  console.log(`${name.padEnd(26)} ${String(alerted).padStart(3)}/${SEEDS}`)
})
