import { describe, expect, it } from 'vitest'
import { gaussianSmoothReference, KSMOOTH_SIGMA_PER_BANDWIDTH } from '#shared/analysis/gaussianSmoother'
import { createRng } from '#shared/analysis/random'
import { WINDOW_BANDWIDTH_SHARE, windowResiduals } from '#shared/analysis/windowDetrend'

// The trend window is detrended as the published pipeline detrends a record (Dakos et al. 2012,
// PLoS ONE 7:e41010): values minus a Gaussian kernel smooth whose ksmooth bandwidth is a share of
// the span. The exact O(n²) smoother is the reference; the fast one agrees within 6.4e-5·range
// (gaussianSmoother.ts, checked in detrend.test.ts).
describe('window detrending for the trend test', () => {
  const rng = createRng(5)
  const n = 800
  const times = Float64Array.from({ length: n }, (_, i) => 1000 + 2 * i)
  const values = Float64Array.from(times, t => 0.01 * t + Math.sin(t / 300) + rng.normal())

  it('is the window minus its Gaussian smooth at a quarter of the span (ksmooth convention)', () => {
    const start = 200, end = 700
    const t = times.subarray(start, end), v = values.subarray(start, end)
    const sigma = WINDOW_BANDWIDTH_SHARE * (t[t.length - 1]! - t[0]!) * KSMOOTH_SIGMA_PER_BANDWIDTH
    const reference = gaussianSmoothReference(t, v, sigma)
    const range = Math.max(...v) - Math.min(...v)
    const residuals = windowResiduals(times, values, start, end)
    expect(residuals.length).toBe(end - start)
    residuals.forEach((r, i) => expect(Math.abs(r - (v[i]! - reference[i]!))).toBeLessThanOrEqual(6.4e-5 * range))
  })

  it('reads nothing outside the window, so a look can be judged again exactly', () => {
    const changed = values.slice()
    for (let i = 0; i < 200; i++) changed[i] = 1e6
    for (let i = 700; i < n; i++) changed[i] = -1e6
    expect(Array.from(windowResiduals(times, changed, 200, 700))).toEqual(Array.from(windowResiduals(times, values, 200, 700)))
  })

  it('leaves nothing of a constant level, and nothing of a window with no span', () => {
    const level = new Float64Array(n).fill(42)
    windowResiduals(times, level, 0, n).forEach(r => expect(Math.abs(r)).toBeLessThan(1e-9))
    expect(Array.from(windowResiduals(new Float64Array(3).fill(7), Float64Array.from([1, 2, 3]), 0, 3))).toEqual([0, 0, 0])
  })
})
