import { describe, expect, it } from 'vitest'
import { analyseWindow } from '#shared/analysis/windowAnalysis'
import { checkQuality, DEFAULT_QUALITY_LIMITS } from '#shared/analysis/quality'
import { createRng } from '#shared/analysis/random'

// Each check is fed the defect it is meant to catch (docs/science.md §S2.1) and a clean
// signal it must pass; the limits are the defaults in quality.ts.
const n = 1000
const times = Float64Array.from({ length: n }, (_, i) => 10 * i)
const rng = createRng(31)
const clean = Float64Array.from({ length: n }, () => 50 + rng.normal())
const limits = { ...DEFAULT_QUALITY_LIMITS, maxGapSeconds: 60 }

describe('quality gate', () => {
  it('passes a clean noisy signal', () => {
    expect(checkQuality(times, clean, limits)).toEqual({ ok: true })
  })
  it('fails too few samples', () => {
    expect(checkQuality(times.subarray(0, 50), clean.subarray(0, 50), limits)).toMatchObject({ ok: false, failed: 'too few samples' })
  })
  it('fails a gap longer than the limit', () => {
    const gappy = Float64Array.from(times, (t, i) => (i > 500 ? t + 120 : t))
    expect(checkQuality(gappy, clean, limits)).toMatchObject({ ok: false, failed: 'gap' })
  })
  it('fails a flat-lined (stuck) sensor', () => {
    expect(checkQuality(times, new Float64Array(n).fill(3.2), limits)).toMatchObject({ ok: false, failed: 'stuck' })
  })
  it('fails a signal quantized to a few levels', () => {
    const coarse = Float64Array.from(clean, v => Math.round(v / 2) * 2)
    expect(checkQuality(times, coarse, limits)).toMatchObject({ ok: false, failed: 'quantized' })
  })
  it('fails a signal whose SD is under 2 resolution steps (A5 item 7: require σ ≥ 2q)', () => {
    const steps = Float64Array.from(clean, v => Math.round(v / 0.75) * 0.75)
    expect(checkQuality(times, steps, limits)).toMatchObject({ ok: false, failed: 'quantized' })
  })
  it('passes a finely quantized signal (12-bit-like steps well below the noise)', () => {
    const fine = Float64Array.from(clean, v => Math.round(v / 0.01) * 0.01)
    expect(checkQuality(times, fine, limits)).toEqual({ ok: true })
  })
  it('fails a deadband-compressed record (long runs of the last stored value)', () => {
    const held = Float64Array.from(clean)
    for (let i = 300; i < 400; i++) held[i] = held[299]!
    expect(checkQuality(times, held, limits)).toMatchObject({ ok: false, failed: 'compressed' })
  })
  it('fails a record rebuilt by linear interpolation between breakpoints (swinging-door style)', () => {
    const interpolated = Float64Array.from(clean)
    for (let i = 0; i < n; i++) {
      const a = Math.floor(i / 8) * 8
      const b = Math.min(a + 8, n - 1)
      if (b > a) interpolated[i] = clean[a]! + (clean[b]! - clean[a]!) * (i - a) / (b - a)
    }
    expect(checkQuality(times, interpolated, limits)).toMatchObject({ ok: false, failed: 'compressed' })
  })
  it('a failed window yields no indicators at all', () => {
    const result = analyseWindow(times, new Float64Array(n).fill(1), { detrend: { kind: 'none' }, quality: limits })
    expect(result.indicators).toBeNull()
    expect(result.quality).toMatchObject({ ok: false, failed: 'stuck' })
  })
})
