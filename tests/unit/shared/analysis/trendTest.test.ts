import { describe, expect, it } from 'vitest'
import { createRng } from '#shared/analysis/random'
import { simulateOu } from '#shared/analysis/simulate'
import { surrogateTrendTest } from '#shared/analysis/trendTest'
import type { SurrogateKind } from '#shared/analysis/surrogates'
import { binomialBounds } from './support/binomial'

// Monte-Carlo test validity (Davison & Hinkley 1997, via docs/science.md §S3.5): under a stationary
// null p = (1 + #{τ* ≥ τ})/(N + 1) is uniform on {1/(N+1), …, 1}, so with N = 99 the rejection
// probability at α = 0.05 is 5/100 exactly for exchangeable surrogates and ≈ 0.05 for fitted ones.
// Over 200 trend-free AR(1) series the count is Binomial(200, 0.05); bounds at 0.1% per side.
describe('surrogate trend test rejects trend-free red noise at its nominal rate', () => {
  it.each(['ar1', 'phase'] as SurrogateKind[])('%s surrogates: rejections of 200 null series at α = 0.05 within binomial bounds', (kind) => {
    const rng = createRng(kind === 'ar1' ? 77 : 78)
    const series = 200
    let rejections = 0
    for (let s = 0; s < series; s++) {
      const { times, values } = simulateOu({ samples: 256, dt: 1, k: 0.2, sigma: 1 }, rng)
      const result = surrogateTrendTest(times, values, {
        window: { kind: 'count', samples: 100 }, step: 2, surrogates: 99, kind, indicators: ['ar1'],
      }, rng)
      if (result.ar1!.p <= 0.05) rejections++
    }
    const [low, high] = binomialBounds(series, 0.05)
    expect(low).toBe(2)
    expect(high).toBe(21)
    expect(rejections).toBeGreaterThanOrEqual(low)
    expect(rejections).toBeLessThanOrEqual(high)
  }, 30_000)

  // Power check: the same test must see a real loss of stability. k falls from 1 to 0.05 over the
  // record (φ = e^{−k} rises from 0.37 to 0.95), the situation the indicator is built for.
  it('detects a steadily falling recovery rate', () => {
    const rng = createRng(79)
    let rejections = 0
    for (let s = 0; s < 20; s++) {
      const { times, values } = simulateOu({ samples: 400, dt: 1, k: t => 1 - 0.95 * t / 400, sigma: 1 }, rng)
      const result = surrogateTrendTest(times, values, {
        window: { kind: 'count', samples: 200 }, step: 2, surrogates: 99, kind: 'ar1', indicators: ['ar1', 'variance'],
      }, rng)
      if (result.ar1!.p <= 0.05) rejections++
      expect(result.ar1!.tau).toBeGreaterThan(0)
    }
    expect(rejections).toBeGreaterThanOrEqual(15)
  }, 30_000)
})
