// The live evaluation of one tag (shared/pipeline/evaluateRecord): when it judges, what steps do
// to its windows, and that a fold approach is judged "slowing down" with a band that holds the
// fold while a steady series is not. Check values come from the OU process (docs/science.md §S2.3: an
// OU process sampled at Δ is an AR(1) with φ = e^{−kΔ}) and the fold's square-root law (§S1.1).
import { describe, expect, it } from 'vitest'
import { createRng } from '#shared/analysis/random'
import { simulateOu } from '#shared/analysis/simulate'
import { evaluateRecord, SETTLING, type EvaluationPoint } from '#shared/pipeline/evaluateRecord'
import { defaultIndicatorSettings, slidingLookAlpha } from '#shared/pipeline/indicatorDefaults'

const settings = defaultIndicatorSettings(1)

function evaluate(times: Float64Array, values: Float64Array, tagId = 1) {
  return evaluateRecord({ tagId, times, values, firstNew: 0, samplesSinceEvaluation: 0, samplePeriodS: 1, settings }).points
}

describe('expanding windows', () => {
  const steady = simulateOu({ samples: 600, dt: 1, k: 0.5, sigma: 0.2 }, createRng(11))
  const points = evaluate(steady.times, steady.values)

  it('evaluates every evaluateEvery-th sample', () => {
    expect(points).toHaveLength(Math.floor(600 / settings.evaluateEvery))
    expect(points[0]!.time).toBe(settings.evaluateEvery - 1)
  })

  it('first judges once the warm-up (one detrending bandwidth) and minTrendSamples have passed', () => {
    const firstJudged = points.find(p => p.evidence !== null)!
    const warmUp = settings.detrendBandwidthS
    expect(firstJudged.time + 1).toBeGreaterThanOrEqual(warmUp + settings.minTrendSamples)
    expect(firstJudged.time + 1).toBeLessThan(warmUp + settings.minTrendSamples + settings.evaluateEvery)
    expect(points.filter(p => p.time < warmUp).every(p => p.quality?.startsWith('warming up'))).toBe(true)
  })
})

describe('steps restart the windows', () => {
  const base = simulateOu({ samples: 900, dt: 1, k: 0.5, sigma: 0.2 }, createRng(12))
  // A trip: the level moves by 50 stationary SDs (SD = σ/√(2k) = 0.2) at sample 450.
  const tripped = Float64Array.from(base.values, (v, i) => (i >= 450 ? v + 10 : v))
  const points = evaluate(base.times, tripped)

  it('says "settling after a step" for one bandwidth after the jump, then judges again', () => {
    const settling = points.filter(p => p.quality === SETTLING)
    expect(settling.length).toBeGreaterThan(0)
    expect(settling[0]!.time).toBeGreaterThanOrEqual(450)
    expect(settling.at(-1)!.time).toBeLessThan(450 + settings.detrendBandwidthS)
  })

  it('never lets the jump into a window: no judgement straddles it, none says slowing down', () => {
    const after = points.filter(p => p.time >= 450)
    expect(after.every(p => p.evidence !== 'slowing down')).toBe(true)
    const firstJudgedAfter = after.find(p => p.evidence !== null)
    if (firstJudgedAfter) expect(firstJudgedAfter.time + 1 - 450)
      .toBeGreaterThanOrEqual(settings.detrendBandwidthS + settings.minTrendSamples)
  })
})

describe('a fold approach against a steady series (seeded, many records)', () => {
  // k(t) = k₀·√(1 − t/t_c): λ² falls linearly to zero at t_c (docs/science.md §S1.1). The record stops
  // 100 s before the fold. k₀ = 0.5 (φ from 0.61 toward 1).
  const FOLD = 1_300
  const RECORDS = 30
  const last = (seed: number, fold: boolean) => {
    const series = simulateOu({
      samples: 1_200, dt: 1, k: fold ? (t: number) => 0.5 * Math.sqrt(1 - t / FOLD) : 0.5, sigma: 0.2
    }, createRng(seed))
    return evaluate(series.times, series.values, seed).at(-1)!
  }
  const approaches = Array.from({ length: RECORDS }, (_, s) => last(100 + s, true))
  const steadies = Array.from({ length: RECORDS }, (_, s) => last(200 + s, false))

  it('judges over half the approaches "slowing down" at their last look, and almost no steady record (α 0.001 per look)', () => {
    const hits = approaches.filter(p => p.evidence === 'slowing down').length
    const falseHits = steadies.filter(p => p.evidence === 'slowing down').length
    expect(hits).toBeGreaterThanOrEqual(RECORDS * 0.5)
    // Binomial(30, 0.001): P(≥ 2) ≈ 0.0004.
    expect(falseHits).toBeLessThanOrEqual(1)
  })

  it('projects the fold with a band that holds it on most approaches, and rarely on steady records', () => {
    const projected = approaches.filter(p => p.fold.kind === 'projected')
    const covering = projected.filter(p => p.fold.kind === 'projected' && p.time + p.fold.lowSeconds <= FOLD && FOLD <= p.time + p.fold.highSeconds)
    expect(projected.length).toBeGreaterThanOrEqual(RECORDS * 0.6)
    expect(covering.length).toBeGreaterThanOrEqual(projected.length * 0.8)
    expect(steadies.filter(p => p.fold.kind === 'projected').length).toBeLessThanOrEqual(3)
  })
})

describe('once the trend window slides, slowing down takes two looks in a row', () => {
  // A 60 s tag with a 400-sample trend window: windows slide early, and the sliding look's α
  // (slidingLookAlpha) is large enough for looks to pass. Fold approaches as above.
  const period = 60
  const sliding = { ...defaultIndicatorSettings(period), trendWindowSamples: 400 }
  const FOLD = 1_300
  const records = Array.from({ length: 20 }, (_, s) => {
    const series = simulateOu({ samples: 1_200, dt: 1, k: (t: number) => 0.5 * Math.sqrt(1 - t / FOLD), sigma: 0.2 }, createRng(300 + s))
    const times = series.times.map(t => t * period)
    return evaluateRecord({
      tagId: s, times, values: series.values, firstNew: 0, samplesSinceEvaluation: 0, samplePeriodS: period, settings: sliding
    }).points
  })
  const slidingAlpha = slidingLookAlpha(sliding, period)
  const usableFrom = sliding.detrendBandwidthS / period
  const isSliding = (p: EvaluationPoint) => p.time / period + 1 - usableFrom >= sliding.trendWindowSamples

  it('never says slowing down on a sliding look whose predecessor failed its own α', () => {
    let said = 0
    for (const points of records) {
      points.forEach((p, i) => {
        if (!isSliding(p) || p.evidence !== 'slowing down') return
        said++
        const previous = points[i - 1]!
        expect(previous.pAr1).not.toBeNull()
        expect(previous.pAr1!).toBeLessThanOrEqual(isSliding(previous) ? slidingAlpha : sliding.alpha)
      })
    }
    // The rule is exercised: the approaches do raise on sliding looks.
    expect(said).toBeGreaterThanOrEqual(2)
  })
})
