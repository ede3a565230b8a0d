// Standard normal distribution function and its inverse, accurate to ~1e-14 (needed for p-values
// and bands; simple-statistics' table lookup is only good to a few digits).

/** Complementary error function erfc(x), relative error ~1e-14. */
export function erfc(x: number): number {
  if (x < 0) return 2 - erfc(-x)
  if (x < 2) return 1 - erfSeries(x)
  return erfcContinuedFraction(x)
}

// Maclaurin series erf(x) = 2/√π Σ (−1)^k x^{2k+1}/(k!(2k+1)); converges fast for x < 2.
function erfSeries(x: number): number {
  let term = x
  let sum = x
  const x2 = x * x
  for (let k = 1; k < 200; k++) {
    term *= -x2 / k
    const add = term / (2 * k + 1)
    sum += add
    if (Math.abs(add) < 1e-17 * Math.abs(sum)) break
  }
  return (2 / Math.sqrt(Math.PI)) * sum
}

// Laplace continued fraction erfc(x) = e^{−x²}/√π · 1/(x + 1/2/(x + 1/(x + 3/2/(x + …)))),
// evaluated by the modified Lentz method.
function erfcContinuedFraction(x: number): number {
  const tiny = 1e-300
  let f = x
  let c = x
  let d = 0
  for (let k = 1; k < 500; k++) {
    const a = k / 2
    d = x + a * d
    d = Math.abs(d) < tiny ? 1 / tiny : 1 / d
    c = x + a / c
    if (Math.abs(c) < tiny) c = tiny
    const delta = c * d
    f *= delta
    if (Math.abs(delta - 1) < 1e-16) break
  }
  return Math.exp(-x * x) / (Math.sqrt(Math.PI) * f)
}

/** Φ(z), the standard normal distribution function. */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2)
}

/** Upper tail 1 − Φ(z), without the cancellation of 1 − normalCdf(z) for large z. */
export function normalUpperTail(z: number): number {
  return 0.5 * erfc(z / Math.SQRT2)
}

/**
 * Φ⁻¹(p): Acklam's rational approximation (relative error 1.15e-9) [from memory], polished by one
 * Halley step against normalCdf to full double precision.
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`probability must be in (0, 1), got ${p}`)
  const x = acklam(p)
  const e = normalCdf(x) - p
  const u = e * Math.sqrt(2 * Math.PI) * Math.exp(x * x / 2)
  return x - u / (1 + x * u / 2)
}

function acklam(p: number): number {
  const a = [-3.969683028665376e+01, 2.209460984245205e+02, -2.759285104469687e+02,
    1.383577518672690e+02, -3.066479806614716e+01, 2.506628277459239e+00]
  const b = [-5.447609879822406e+01, 1.615858368580409e+02, -1.556989798598866e+02, 6.680131188771972e+01, -1.328068155288572e+01]
  const c = [-7.784894002430293e-03, -3.223964580411365e-01, -2.400758277161838e+00,
    -2.549732539343734e+00, 4.374664141464968e+00, 2.938163982698783e+00]
  const d = [7.784695709041462e-03, 3.224671290700398e-01, 2.445134137142996e+00, 3.754408661907416e+00]
  const tail = (q: number): number =>
    (((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!)
    / ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1)
  if (p < 0.02425) return tail(Math.sqrt(-2 * Math.log(p)))
  if (p > 1 - 0.02425) return -tail(Math.sqrt(-2 * Math.log(1 - p)))
  const q = p - 0.5
  const r = q * q
  return (((((a[0]! * r + a[1]!) * r + a[2]!) * r + a[3]!) * r + a[4]!) * r + a[5]!) * q
    / (((((b[0]! * r + b[1]!) * r + b[2]!) * r + b[3]!) * r + b[4]!) * r + 1)
}
