// Seeded randomness for the simulators: the same seed gives the same plant history, so a demo
// or a test can be replayed exactly. Not for anything that needs cryptographic quality.

/** Uniform generator on [0, 1). */
export type Uniform = () => number
/** Standard normal generator, N(0, 1). */
export type Normal = () => number

/**
 * mulberry32 (Tommy Ettinger, public domain, 2017) [from memory]: a 32-bit state generator,
 * tiny and fast, with a period of 2^32 — plenty for one simulated unit's noise stream.
 */
export function mulberry32(seed: number): Uniform {
  let state = seed >>> 0
  return () => {
    state = (state + 0x6d2b79f5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/**
 * Box–Muller transform (Box & Muller 1958) [from memory]: two uniforms give two independent
 * standard normals; the second is kept for the next call so no draw is wasted.
 */
export function boxMuller(uniform: Uniform): Normal {
  let spare: number | undefined
  return () => {
    if (spare !== undefined) {
      const value = spare
      spare = undefined
      return value
    }
    // 1 − u keeps the logarithm's argument in (0, 1], never log(0).
    const radius = Math.sqrt(-2 * Math.log(1 - uniform()))
    const angle = 2 * Math.PI * uniform()
    spare = radius * Math.sin(angle)
    return radius * Math.cos(angle)
  }
}

/** A normal generator from a seed: what every simulated unit uses. */
export function seededNormal(seed: number): Normal {
  return boxMuller(mulberry32(seed))
}

/**
 * A seed for one named stream derived from the run's seed (FNV-1a over the name), so each unit
 * and each unit's sensors get independent noise that still replays exactly.
 */
export function deriveSeed(seed: number, streamName: string): number {
  let hash = (0x811c9dc5 ^ seed) >>> 0
  for (const char of streamName) hash = Math.imul(hash ^ char.charCodeAt(0), 0x01000193) >>> 0
  return hash
}
