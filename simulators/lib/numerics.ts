// Small numerical tools used to locate equilibria and folds from the model equations themselves,
// so the fold a test checks is the one the simulator actually integrates.

/** Root of a continuous f on [low, high] by bisection; f(low) and f(high) must differ in sign. */
export function bisect(f: (x: number) => number, low: number, high: number, tolerance = 1e-12): number {
  let fLow = f(low)
  if (fLow === 0) return low
  if (fLow * f(high) > 0) throw new RangeError(`no sign change of f on [${low}, ${high}]`)
  let a = low
  let b = high
  while (b - a > tolerance * Math.max(1, Math.abs(a))) {
    const mid = (a + b) / 2
    const fMid = f(mid)
    if (fMid === 0) return mid
    if (fMid * fLow < 0) b = mid
    else { a = mid; fLow = fMid }
  }
  return (a + b) / 2
}

/** Location of the maximum of a unimodal f on [low, high] (golden-section search). */
export function goldenMaximum(f: (x: number) => number, low: number, high: number, tolerance = 1e-10): number {
  const ratio = (Math.sqrt(5) - 1) / 2
  let a = low
  let b = high
  let c = b - ratio * (b - a)
  let d = a + ratio * (b - a)
  let fc = f(c)
  let fd = f(d)
  while (b - a > tolerance) {
    if (fc > fd) { b = d; d = c; fd = fc; c = b - ratio * (b - a); fc = f(c) }
    else { a = c; c = d; fc = fd; d = a + ratio * (b - a); fd = f(d) }
  }
  return (a + b) / 2
}

/** Jacobian of f at x by central differences (relative step, good to ~1e-8 for smooth models). */
export function numericalJacobian(f: (x: readonly number[]) => number[], x: readonly number[]): number[][] {
  const n = x.length
  const jacobian = Array.from({ length: n }, () => new Array<number>(n).fill(0))
  for (let j = 0; j < n; j++) {
    const h = 1e-6 * Math.max(1, Math.abs(x[j]!))
    const plus = [...x]; plus[j] = x[j]! + h
    const minus = [...x]; minus[j] = x[j]! - h
    const fPlus = f(plus)
    const fMinus = f(minus)
    for (let i = 0; i < n; i++) jacobian[i]![j] = (fPlus[i]! - fMinus[i]!) / (2 * h)
  }
  return jacobian
}

/** Eigenvalues of a 2×2 matrix: real parts, with the imaginary part of a complex pair. */
export function eigenvalues2x2(m: readonly (readonly number[])[]): { re: [number, number]; im: number } {
  const trace = m[0]![0]! + m[1]![1]!
  const det = m[0]![0]! * m[1]![1]! - m[0]![1]! * m[1]![0]!
  const disc = trace * trace / 4 - det
  if (disc >= 0) {
    const root = Math.sqrt(disc)
    return { re: [trace / 2 - root, trace / 2 + root], im: 0 }
  }
  return { re: [trace / 2, trace / 2], im: Math.sqrt(-disc) }
}

/** Least negative real part: the slow mode that critical slowing down is about. */
export function slowestRate(m: readonly (readonly number[])[]): number {
  return Math.max(...eigenvalues2x2(m).re)
}

/**
 * First local maximum of f on [low, high]: scan a grid, then refine with golden section between
 * the neighbours of the first grid peak. Used to trace a fold as the turning point of an
 * equilibrium branch parametrised by a state variable.
 */
export function firstLocalMaximum(f: (x: number) => number, low: number, high: number, gridPoints = 2000): number {
  const step = (high - low) / gridPoints
  let previous = f(low)
  for (let i = 1; i < gridPoints; i++) {
    const current = f(low + i * step)
    const next = f(low + (i + 1) * step)
    if (current >= previous && current > next) return goldenMaximum(f, low + (i - 1) * step, low + (i + 1) * step)
    previous = current
  }
  throw new RangeError(`no interior local maximum on [${low}, ${high}]`)
}

/** Every root of f on [low, high] found by scanning for sign changes, then bisecting each. */
export function allRoots(f: (x: number) => number, low: number, high: number, gridPoints = 4000): number[] {
  const step = (high - low) / gridPoints
  const roots: number[] = []
  let a = low
  let fa = f(a)
  for (let i = 1; i <= gridPoints; i++) {
    const b = low + i * step
    const fb = f(b)
    if (fa === 0) roots.push(a)
    else if (fa * fb < 0) roots.push(bisect(f, a, b))
    a = b
    fa = fb
  }
  return roots
}
