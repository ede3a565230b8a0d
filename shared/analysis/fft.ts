// Discrete Fourier transform of any length: iterative radix-2 Cooley–Tukey for powers of two,
// Bluestein's chirp-z re-expression for every other length (both [common practice]).
// Convention: X_k = Σ_j x_j·e^{−2πijk/n} forward; the inverse divides by n.

/** A complex vector as two parallel arrays. */
export interface ComplexArray {
  re: Float64Array
  im: Float64Array
}

/** Forward DFT of (re, im); returns a new pair. */
export function fft(input: ComplexArray): ComplexArray {
  return transform(input, -1)
}

/** Inverse DFT (with the 1/n factor); returns a new pair. */
export function inverseFft(input: ComplexArray): ComplexArray {
  const out = transform(input, 1)
  const n = out.re.length
  for (let k = 0; k < n; k++) {
    out.re[k]! /= n
    out.im[k]! /= n
  }
  return out
}

function transform(input: ComplexArray, sign: 1 | -1): ComplexArray {
  const n = input.re.length
  const out = { re: Float64Array.from(input.re), im: Float64Array.from(input.im) }
  if (n <= 1) return out
  if (isPowerOfTwo(n)) radix2InPlace(out.re, out.im, sign)
  else return bluestein(input, sign)
  return out
}

function isPowerOfTwo(n: number): boolean {
  return (n & (n - 1)) === 0
}

function radix2InPlace(re: Float64Array, im: Float64Array, sign: 1 | -1): void {
  const n = re.length
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1
    for (; j & bit; bit >>= 1) j ^= bit
    j ^= bit
    if (i < j) {
      [re[i], re[j]] = [re[j]!, re[i]!];
      [im[i], im[j]] = [im[j]!, im[i]!]
    }
  }
  for (let size = 2; size <= n; size *= 2) {
    const half = size / 2
    const angle = (sign * 2 * Math.PI) / size
    for (let k = 0; k < half; k++) {
      const wr = Math.cos(angle * k)
      const wi = Math.sin(angle * k)
      for (let start = 0; start < n; start += size) {
        const a = start + k
        const b = a + half
        const tr = re[b]! * wr - im[b]! * wi
        const ti = re[b]! * wi + im[b]! * wr
        re[b] = re[a]! - tr
        im[b] = im[a]! - ti
        re[a]! += tr
        im[a]! += ti
      }
    }
  }
}

// X_k = conj(w_k)·Σ_j (x_j·conj(w_j))·w_{k−j} with w_m = e^{iπm²/n}: a convolution, done by
// power-of-two FFTs of length ≥ 2n − 1.
function bluestein(input: ComplexArray, sign: 1 | -1): ComplexArray {
  const n = input.re.length
  let m = 1
  while (m < 2 * n - 1) m *= 2
  const chirpRe = new Float64Array(n)
  const chirpIm = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    // k² mod 2n keeps the angle small and exact for large k.
    const angle = (Math.PI * ((k * k) % (2 * n))) / n
    chirpRe[k] = Math.cos(angle)
    chirpIm[k] = -sign * Math.sin(angle)
  }
  const aRe = new Float64Array(m)
  const aIm = new Float64Array(m)
  for (let k = 0; k < n; k++) {
    aRe[k] = input.re[k]! * chirpRe[k]! + input.im[k]! * chirpIm[k]!
    aIm[k] = input.im[k]! * chirpRe[k]! - input.re[k]! * chirpIm[k]!
  }
  const bRe = new Float64Array(m)
  const bIm = new Float64Array(m)
  for (let k = 0; k < n; k++) {
    bRe[k] = chirpRe[k]!
    bIm[k] = chirpIm[k]!
    if (k > 0) {
      bRe[m - k] = chirpRe[k]!
      bIm[m - k] = chirpIm[k]!
    }
  }
  radix2InPlace(aRe, aIm, -1)
  radix2InPlace(bRe, bIm, -1)
  for (let k = 0; k < m; k++) {
    const re = aRe[k]! * bRe[k]! - aIm[k]! * bIm[k]!
    aIm[k] = aRe[k]! * bIm[k]! + aIm[k]! * bRe[k]!
    aRe[k] = re
  }
  radix2InPlace(aRe, aIm, 1)
  const out = { re: new Float64Array(n), im: new Float64Array(n) }
  for (let k = 0; k < n; k++) {
    const re = aRe[k]! / m
    const im = aIm[k]! / m
    out.re[k] = re * chirpRe[k]! + im * chirpIm[k]!
    out.im[k] = im * chirpRe[k]! - re * chirpIm[k]!
  }
  return out
}
