// Root and extremum finders for locating equilibria and bifurcation points of the benchmark
// models numerically, so no critical parameter value has to be trusted from memory. The finders
// are the simulators' own (one owner); the bench adds only a scalar derivative.
export { bisect, goldenMaximum as argMax } from '../../../simulators/lib/numerics'

/** Central-difference derivative; the step is relative so it works at any scale of x. */
export function derivative(f: (x: number) => number, x: number): number {
  const h = 1e-6 * Math.max(1, Math.abs(x))
  return (f(x + h) - f(x - h)) / (2 * h)
}
