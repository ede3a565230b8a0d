import { describe, expect, it } from 'vitest'
import { fft, inverseFft } from '#shared/analysis/fft'
import { createRng } from '#shared/analysis/random'
import { fitAr1, phaseSurrogateGenerator, shuffleSurrogateGenerator, ar1SurrogateGenerator } from '#shared/analysis/surrogates'

// Direct evaluation of the DFT definition X_k = Σ_j x_j·e^{−2πijk/n} [common practice].
function naiveDft(re: Float64Array, im: Float64Array) {
  const n = re.length
  const out = { re: new Float64Array(n), im: new Float64Array(n) }
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < n; j++) {
      const angle = (-2 * Math.PI * ((j * k) % n)) / n
      out.re[k]! += re[j]! * Math.cos(angle) - im[j]! * Math.sin(angle)
      out.im[k]! += re[j]! * Math.sin(angle) + im[j]! * Math.cos(angle)
    }
  }
  return out
}

describe('FFT (radix-2 and Bluestein) equals the DFT definition', () => {
  const rng = createRng(3)
  it.each([1, 2, 3, 8, 12, 64, 97, 100, 255])('n = %i', (n) => {
    const re = Float64Array.from({ length: n }, () => rng.normal())
    const im = Float64Array.from({ length: n }, () => rng.normal())
    const fast = fft({ re, im })
    const slow = naiveDft(re, im)
    for (let k = 0; k < n; k++) {
      expect(fast.re[k]).toBeCloseTo(slow.re[k]!, 9)
      expect(fast.im[k]).toBeCloseTo(slow.im[k]!, 9)
    }
    const back = inverseFft(fast)
    for (let k = 0; k < n; k++) expect(back.re[k]).toBeCloseTo(re[k]!, 12)
  })
})

describe('surrogates', () => {
  const rng = createRng(9)
  const data = new Float64Array(301)
  for (let i = 1; i < data.length; i++) data[i] = 0.8 * data[i - 1]! + rng.normal()

  // Theiler et al. 1992: phase randomisation keeps every Fourier amplitude |X_k| and gives a real series.
  it.each([300, 301])('phase-randomised (n = %i) keep the amplitude spectrum and are real', (n) => {
    const values = data.subarray(0, n)
    const surrogate = phaseSurrogateGenerator(values)(rng)
    const original = fft({ re: Float64Array.from(values), im: new Float64Array(n) })
    const randomised = fft({ re: surrogate, im: new Float64Array(n) })
    for (let k = 0; k < n; k++) {
      expect(Math.hypot(randomised.re[k]!, randomised.im[k]!)).toBeCloseTo(Math.hypot(original.re[k]!, original.im[k]!), 8)
    }
    expect(surrogate.some((v, i) => Math.abs(v - values[i]!) > 1e-6)).toBe(true)
  })

  it('shuffles are permutations of the data', () => {
    const shuffled = shuffleSurrogateGenerator(data)(rng)
    expect(Array.from(shuffled).sort()).toEqual(Array.from(data).sort())
  })

  // AR(1) surrogates follow the fitted model: the pooled r₁ of 40 surrogates of length 301 has
  // SE ≈ √((1 − φ²)/(40·301)) (docs/science.md §S2.3) ≈ 0.0055, plus the small-sample bias −(1 + 4φ)/n ≈ −0.014
  // of the NIST r₁ estimator (docs/science.md §S2.3 table); we allow bias + 5 SE.
  it('AR(1) surrogates reproduce the fitted φ within bias + 5 SE', () => {
    const fit = fitAr1(data)
    const generate = ar1SurrogateGenerator(data)
    const phis = Array.from({ length: 40 }, () => fitAr1(generate(rng)).phi)
    const meanPhi = phis.reduce((a, b) => a + b, 0) / phis.length
    const se = Math.sqrt((1 - fit.phi ** 2) / (40 * 301))
    const bias = -(1 + 4 * fit.phi) / 301
    expect(Math.abs(meanPhi - (fit.phi + bias))).toBeLessThan(5 * se)
  })
})
