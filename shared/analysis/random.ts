// Seeded pseudo-random numbers, so surrogates, simulations and tests are reproducible.

/** A seeded stream of random numbers. Not cryptographic. */
export interface Rng {
  /** Uniform on [0, 1). */
  uniform(): number
  /** Standard normal N(0, 1). */
  normal(): number
  /** Uniform integer on 0 … n − 1. */
  integer(n: number): number
}

/**
 * mulberry32 (a 32-bit counter passed through a mixing function) [common practice]; its period of
 * 2³² draws is far more than one analysis uses. Normals come from the Marsaglia polar method,
 * which yields two per accepted pair; the spare one is kept.
 */
export function createRng(seed: number): Rng {
  let state = seed >>> 0
  let spare: number | null = null
  const uniform = (): number => {
    state = (state + 0x6D2B79F5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
  const normal = (): number => {
    if (spare !== null) {
      const value = spare
      spare = null
      return value
    }
    let u = 0
    let v = 0
    let s = 0
    do {
      u = 2 * uniform() - 1
      v = 2 * uniform() - 1
      s = u * u + v * v
    } while (s >= 1 || s === 0)
    const scale = Math.sqrt(-2 * Math.log(s) / s)
    spare = v * scale
    return u * scale
  }
  return { uniform, normal, integer: n => Math.floor(uniform() * n) }
}
