// Root and extremum finders for locating equilibria and bifurcation points of the benchmark
// models numerically, so no critical parameter value has to be trusted from memory.

/** A root of f in [lo, hi], given f(lo) and f(hi) of opposite signs (bisection to `tolerance`). */
export function bisect(f: (x: number) => number, lo: number, hi: number, tolerance = 1e-12): number {
  let fLo = f(lo)
  if (fLo === 0) return lo
  if (Math.sign(fLo) === Math.sign(f(hi))) throw new RangeError(`no sign change of f on [${lo}, ${hi}]`)
  for (let step = 0; step < 200 && hi - lo > tolerance; step++) {
    const mid = (lo + hi) / 2
    const fMid = f(mid)
    if (fMid === 0) return mid
    if (Math.sign(fMid) === Math.sign(fLo)) {
      lo = mid
      fLo = fMid
    } else {
      hi = mid
    }
  }
  return (lo + hi) / 2
}

/** Where a unimodal f peaks on [lo, hi] (golden-section search). */
export function argMax(f: (x: number) => number, lo: number, hi: number, tolerance = 1e-10): number {
  const ratio = (Math.sqrt(5) - 1) / 2
  let a = lo
  let b = hi
  let c = b - ratio * (b - a)
  let d = a + ratio * (b - a)
  let fc = f(c)
  let fd = f(d)
  while (b - a > tolerance) {
    if (fc > fd) {
      b = d
      d = c
      fd = fc
      c = b - ratio * (b - a)
      fc = f(c)
    } else {
      a = c
      c = d
      fc = fd
      d = a + ratio * (b - a)
      fd = f(d)
    }
  }
  return (a + b) / 2
}

/** Central-difference derivative; the step is relative so it works at any scale of x. */
export function derivative(f: (x: number) => number, x: number): number {
  const h = 1e-6 * Math.max(1, Math.abs(x))
  return (f(x + h) - f(x - h)) / (2 * h)
}
