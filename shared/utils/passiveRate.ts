// The passive estimate of the recovery rate a bump test is compared with: from a window's lag-1
// autocorrelation φ at sample spacing Δ, k = −ln φ / Δ (docs/science.md §S2.3), with the standard
// error of φ for an AR(1), SE(φ) ≈ √((1 − φ²)/n), carried through dk/dφ = −1/(φΔ) (delta method).

export function passiveRateSe(ar1: number, windowSamples: number, samplePeriodS: number): number | null {
  if (!(ar1 > 0 && ar1 < 1) || windowSamples < 3 || !(samplePeriodS > 0)) return null
  return Math.sqrt((1 - ar1 * ar1) / windowSamples) / (ar1 * samplePeriodS)
}
