// Summary statistics for the benchmark tables: binomial rates with Wilson score intervals, ROC
// AUC with its Hanley–McNeil standard error, medians.

const Z95 = 1.959963984540054

export interface Rate {
  hits: number
  trials: number
  /** Wilson 95% score interval; [0, 1] when there are no trials. */
  low: number
  high: number
}

/**
 * Wilson (1927, J Am Stat Assoc 22:209–212) score interval, which unlike the Wald interval stays
 * inside [0, 1] and keeps its coverage at 0 or n hits (Newcombe 1998, Stat Med 17:857–872).
 */
export function wilson(hits: number, trials: number, z = Z95): Rate {
  if (trials === 0) return { hits, trials, low: 0, high: 1 }
  const p = hits / trials
  const z2n = z * z / trials
  const centre = (p + z2n / 2) / (1 + z2n)
  const half = z / (1 + z2n) * Math.sqrt(p * (1 - p) / trials + z2n / (4 * trials))
  return { hits, trials, low: Math.max(0, centre - half), high: Math.min(1, centre + half) }
}

export interface Auc {
  auc: number
  /** Hanley & McNeil (1982, Radiology 143:29–36) standard error [formula from memory]. */
  se: number
  positives: number
  negatives: number
}

/**
 * Area under the ROC curve as the Mann–Whitney probability that a forced record outscores a null
 * one, ties counting one half (so a procedure that gives every record the same score gets 0.5).
 */
export function rocAuc(positives: readonly number[], negatives: readonly number[]): Auc {
  const nP = positives.length
  const nN = negatives.length
  if (nP === 0 || nN === 0) return { auc: Number.NaN, se: Number.NaN, positives: nP, negatives: nN }
  const sorted = [...negatives].sort((a, b) => a - b)
  let wins = 0
  for (const score of positives) {
    const below = lowerBound(sorted, score)
    const notAbove = upperBound(sorted, score)
    wins += below + 0.5 * (notAbove - below)
  }
  const auc = wins / (nP * nN)
  const q1 = auc / (2 - auc)
  const q2 = 2 * auc * auc / (1 + auc)
  const variance = (auc * (1 - auc) + (nP - 1) * (q1 - auc * auc) + (nN - 1) * (q2 - auc * auc)) / (nP * nN)
  return { auc, se: Math.sqrt(Math.max(0, variance)), positives: nP, negatives: nN }
}

/** Number of entries < x in ascending `sorted`. */
function lowerBound(sorted: readonly number[], x: number): number {
  let lo = 0, hi = sorted.length
  while (lo < hi) { const mid = (lo + hi) >> 1; if (sorted[mid]! < x) lo = mid + 1; else hi = mid }
  return lo
}

/** Number of entries ≤ x in ascending `sorted`. */
function upperBound(sorted: readonly number[], x: number): number {
  let lo = 0, hi = sorted.length
  while (lo < hi) { const mid = (lo + hi) >> 1; if (sorted[mid]! <= x) lo = mid + 1; else hi = mid }
  return lo
}

/** Middle value (mean of the two middle ones for an even count); NaN when empty. */
export function median(values: readonly number[]): number {
  if (values.length === 0) return Number.NaN
  const sorted = [...values].sort((a, b) => a - b)
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

/** The q-quantile by linear interpolation between order statistics (R's type 7). */
export function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return Number.NaN
  const position = q * (sorted.length - 1)
  const lo = Math.floor(position)
  const hi = Math.min(sorted.length - 1, lo + 1)
  const a = sorted[lo]!, b = sorted[hi]!
  const fraction = position - lo
  // Infinite order statistics (bootstrap lines that never reach zero) must not yield 0·∞ = NaN.
  return fraction === 0 || a === b ? a : a + fraction * (b - a)
}
