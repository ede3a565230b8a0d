// SE of the passive recovery rate: SE(φ) ≈ √((1 − φ²)/n) for an AR(1) (Box & Jenkins, Time Series
// Analysis §6.3 [from memory]), through k = −ln φ / Δ by the delta method, dk/dφ = −1/(φΔ).
import { describe, expect, it } from 'vitest'
import { passiveRateSe } from '#shared/utils/passiveRate'

describe('passive recovery-rate standard error', () => {
  it('φ 0.9 over 300 samples at 1 s', () => {
    expect(passiveRateSe(0.9, 300, 1)).toBeCloseTo(Math.sqrt(0.19 / 300) / 0.9, 12)
  })
  it('halves with four times the window and scales with 1/Δ', () => {
    expect(passiveRateSe(0.8, 1200, 1)! / passiveRateSe(0.8, 300, 1)!).toBeCloseTo(0.5, 12)
    expect(passiveRateSe(0.8, 300, 2)! / passiveRateSe(0.8, 300, 1)!).toBeCloseTo(0.5, 12)
  })
  it('has none where the rate is undefined (φ ≤ 0 or ≥ 1)', () => {
    expect(passiveRateSe(1, 300, 1)).toBeNull()
    expect(passiveRateSe(-0.2, 300, 1)).toBeNull()
  })
})
