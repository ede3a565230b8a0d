// The unit's slow mode (docs/science.md §S5): a VAR(1) x_{t+1} = A·x_t + e_t fitted by Yule–Walker to
// the tags' residuals; the eigenvalue of A with the largest modulus is the slowest joint recovery,
// and its left eigenvector is the direction in which the unit recovers that slowly.
import { EigenvalueDecomposition, inverse, Matrix } from 'ml-matrix'

export interface SlowMode {
  /** Leading eigenvalue μ of Â (largest modulus) and its modulus. */
  eigenvalue: { re: number, im: number, modulus: number }
  /** −ln|μ|/Δ: the slowest recovery rate; null when |μ| ≥ 1 (no recovery seen in the window). */
  recoveryRate: number | null
  /** Each tag's share of the leading left eigenvector (normalised squares, summing to 1). */
  shares: number[]
  /** All eigenvalues of Â. */
  eigenvalues: { re: number, im: number }[]
  /** Â = C₁·C₀⁻¹ in the tags' own units, row-major. */
  transition: number[][]
}

/**
 * Fits A = C₁C₀⁻¹ with C₀ = Σd_t·d_tᵀ/(n−1) and C₁ = Σd_{t+1}·d_tᵀ/(n−1) (d = residual minus its
 * mean over its standard deviation, per tag) and returns the slow mode; `transition` is Â
 * converted back to the tags' own units. `residuals[j]` is tag j's series; all share the
 * sample times, spaced `dt` seconds apart.
 */
export function slowMode(residuals: readonly ArrayLike<number>[], dt: number): SlowMode {
  const m = residuals.length
  const n = residuals[0]?.length ?? 0
  if (m < 1 || residuals.some(r => r.length !== n)) throw new RangeError('every tag needs a residual series of the same length')
  if (n <= m + 1) throw new RangeError(`${n} samples cannot fit a VAR(1) of ${m} tags`)
  // Each tag is standardised (centred, unit variance) before the fit. The eigenvalues of Â do not
  // change under a per-tag scaling (D·A·D⁻¹ is similar to A), but eigenvectors do: without it a
  // tag in mol/L would get ~0 % of the mode beside one in kelvin purely through its units.
  const sds: number[] = []
  const centred = residuals.map((series, j) => {
    let mean = 0
    for (let t = 0; t < n; t++) mean += series[t]!
    mean /= n
    let ss = 0
    for (let t = 0; t < n; t++) ss += (series[t]! - mean) ** 2
    const sd = Math.sqrt(ss / (n - 1))
    if (!(sd > 0)) throw new RangeError(`tag ${j} has no variation in the window`)
    sds.push(sd)
    return Float64Array.from({ length: n }, (_, t) => (series[t]! - mean) / sd)
  })
  const c0 = Matrix.zeros(m, m)
  const c1 = Matrix.zeros(m, m)
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) {
      c0.set(i, j, crossSum(centred[i]!, centred[j]!, 0) / (n - 1))
      c1.set(i, j, crossSum(centred[i]!, centred[j]!, 1) / (n - 1))
    }
  }
  const transition = c1.mmul(inverse(c0))
  // Left eigenvectors of A are the (right) eigenvectors of Aᵀ; both have the same eigenvalues.
  const decomposition = new EigenvalueDecomposition(transition.transpose())
  const re = decomposition.realEigenvalues
  const im = decomposition.imaginaryEigenvalues
  let lead = 0
  for (let k = 1; k < m; k++) if (Math.hypot(re[k]!, im[k]!) > Math.hypot(re[lead]!, im[lead]!)) lead = k
  const modulus = Math.hypot(re[lead]!, im[lead]!)
  return {
    eigenvalue: { re: re[lead]!, im: im[lead]!, modulus },
    recoveryRate: modulus < 1 ? -Math.log(modulus) / dt : null,
    shares: eigenvectorShares(decomposition, lead),
    eigenvalues: re.map((r, k) => ({ re: r, im: im[k]! })),
    // Back in the tags' own units: A = S·Â_std·S⁻¹ with S = diag(sd).
    transition: transition.to2DArray().map((row, i) => row.map((v, j) => v * sds[i]! / sds[j]!)),
  }
}

/** Σ_t a_{t+lag}·b_t. */
function crossSum(a: Float64Array, b: Float64Array, lag: number): number {
  let sum = 0
  for (let t = 0; t + lag < a.length; t++) sum += a[t + lag]! * b[t]!
  return sum
}

/**
 * Normalised squared moduli of eigenvector `k`. For a complex pair the decomposition stores the
 * real and imaginary parts in columns (j, j+1), j being the member with positive imaginary part.
 */
function eigenvectorShares(decomposition: EigenvalueDecomposition, k: number): number[] {
  const vectors = decomposition.eigenvectorMatrix
  const im = decomposition.imaginaryEigenvalues[k]!
  const realColumn = im < 0 ? k - 1 : k
  const squares = vectors.getColumn(realColumn).map((re, i) => {
    const imag = im === 0 ? 0 : vectors.get(i, realColumn + 1)
    return re * re + imag * imag
  })
  const total = squares.reduce((s, v) => s + v, 0)
  return squares.map(v => v / total)
}
