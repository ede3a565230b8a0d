// Seeded randomness for the simulators: the same seed gives the same plant history, so a demo
// or a test can be replayed exactly. Not for anything that needs cryptographic quality.
// The uniform stream is the engine's own seeded generator (shared/analysis/random.ts); only the
// normal transform is the simulators' own: Box–Muller, kept so a seed replays the same plant
// history it always has (the engine's polar method would draw a different one).
import { createRng } from '../../shared/analysis/random'

/** Uniform generator on [0, 1). */
export type Uniform = () => number
/** Standard normal generator, N(0, 1). */
export type Normal = () => number

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

/** The engine's seeded uniform stream on [0, 1). */
export function seededUniform(seed: number): Uniform {
  return createRng(seed).uniform
}

/** A normal generator from a seed: what every simulated unit uses. */
export function seededNormal(seed: number): Normal {
  return boxMuller(seededUniform(seed))
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
