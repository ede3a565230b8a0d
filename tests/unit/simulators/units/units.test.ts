import { describe, expect, it } from 'vitest'
import { CATALOGUE, catalogueUnit } from '../../../../shared/demo/catalogue'
import { seededNormal } from '../../../../simulators/lib/random'
import { quantise, readSensor } from '../../../../simulators/lib/sensor'
import { UnitSampler } from '../../../../simulators/lib/unitSampler'
import { createUnit } from '../../../../simulators/units/createUnit'

// Residuals about a least-squares line: the slow drift of the mean is not the fluctuation.
function detrended(xs: readonly number[]): number[] {
  const n = xs.length
  const tMean = (n - 1) / 2
  const xMean = xs.reduce((a, b) => a + b, 0) / n
  let sxy = 0
  let stt = 0
  xs.forEach((x, t) => { sxy += (t - tMean) * (x - xMean); stt += (t - tMean) ** 2 })
  return xs.map((x, t) => x - xMean - (sxy / stt) * (t - tMean))
}

function lagOneAutocorrelation(xs: readonly number[]): number {
  const r = detrended(xs)
  let num = 0
  let den = 0
  r.forEach((x, i) => { den += x * x; if (i > 0) num += x * r[i - 1]! })
  return num / den
}

describe.each([
  ['cstr', 'TI-101'],
  ['digester', 'AI-202'],
  ['grid', 'EI-301'],
] as const)('%s demo unit', (code, watchedTag) => {
  it('tips only after its fold, slowing down on the way, then resets and starts again', () => {
    const unit = createUnit(code, { speed: 1, normal: seededNormal(11) })
    const cycle = unit.cycle!
    const sampler = new UnitSampler(unit, catalogueUnit(code), seededNormal(12), 0)
    const watched: number[] = []
    let progressAtTip: number | undefined
    for (let t = 1000; t < 4 * 3_600_000 && cycle.completedCycles === 0; t += 1000) {
      const samples = sampler.samplesUntil(t)
      if (cycle.phase === 'tipped') progressAtTip ??= cycle.progressToFold
      if (progressAtTip === undefined) watched.push(...samples.filter(s => s.tag === watchedTag).map(s => s.value))
    }
    expect(progressAtTip).toBeDefined()
    // The fold is crossed at progress 1; the jump comes after it (docs/science.md §S1.3: slow passage
    // through a fold lags it).
    expect(progressAtTip!).toBeGreaterThanOrEqual(1)
    expect(cycle.completedCycles).toBe(1)
    expect(cycle.phase).toBe('approach')
    // Critical slowing down in what the database receives (sensor noise and quantisation
    // included): lag-1 autocorrelation φ = exp(−2√(r − r_c)·Δt) → 1 at the fold (docs/science.md §S1.2).
    // First quarter of the approach against the last quarter before the fold.
    const atFold = Math.floor(watched.length / progressAtTip!)
    const quarter = Math.floor(atFold / 4)
    const early = lagOneAutocorrelation(watched.slice(0, quarter))
    const late = lagOneAutocorrelation(watched.slice(atFold - quarter, atFold))
    expect(late - early).toBeGreaterThan(0.04)
  })
})

describe('catalogue and sampling', () => {
  it('every unit model produces a value for every catalogued tag, inside its range', () => {
    for (const entry of CATALOGUE) {
      const normal = seededNormal(5)
      const sampler = new UnitSampler(createUnit(entry.code, { speed: 1, normal }), entry, seededNormal(6), 0)
      const samples = sampler.samplesUntil(600_000)
      for (const tag of entry.tags) {
        const ofTag = samples.filter(s => s.tag === tag.code)
        expect(ofTag.length).toBe(600 / tag.samplePeriodSeconds)
        for (const s of ofTag) {
          expect(s.quality).toBe('good')
          expect(s.value).toBeGreaterThanOrEqual(tag.rangeLow)
          expect(s.value).toBeLessThanOrEqual(tag.rangeHigh)
          expect(Date.parse(s.time) % (tag.samplePeriodSeconds * 1000)).toBe(0)
          expect(s.time).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/)
        }
      }
    }
  })

  it('sensors quantise to their resolution and mark saturated readings uncertain', () => {
    const tag = catalogueUnit('cstr').tags[0]!
    expect(quantise(351.2000001, 0.01)).toBe(351.2)
    expect(quantise(0.12345, 0.001)).toBe(0.123)
    const noiseless = () => 0
    expect(readSensor(351.234, tag, noiseless)).toEqual({ value: 351.23, quality: 'good' })
    expect(readSensor(612, tag, noiseless)).toEqual({ value: tag.rangeHigh, quality: 'uncertain' })
  })
})
