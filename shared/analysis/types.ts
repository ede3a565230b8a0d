// Shared shapes of the analysis engine. Times are seconds (any epoch), values are engineering units.

/** How long a rolling window is: a fixed number of samples, or a clock duration. */
export type WindowSpec =
  | { kind: 'count', samples: number }
  | { kind: 'duration', seconds: number }

/**
 * How the slow trend is removed before indicators are computed.
 * - `gaussian`: centred Nadaraya–Watson kernel smoother, `bandwidth` = kernel SD in seconds.
 * - `localLinear`: one-sided (causal) exponentially weighted local-linear fit, `bandwidth` = the
 *   weight's e-folding time in seconds. It follows accelerating trends (docs/science.md §S2.2) and
 *   its residuals never change once computed, so the live path can use it incrementally.
 */
export type DetrendSpec =
  | { kind: 'none' }
  | { kind: 'linear' }
  | { kind: 'gaussian', bandwidth: number }
  | { kind: 'localLinear', bandwidth: number }

/** Sums of powers of deviations from the window mean (d = x − mean); everything else derives from them. */
export interface CentredSums {
  n: number
  mean: number
  /** Σd², Σd³, Σd⁴ over the window. */
  sum2: number
  sum3: number
  sum4: number
  /** Σ_{i≥2} d_i·d_{i−1}: consecutive pairs inside the window (NIST r₁ numerator). */
  lagSum: number
}

/**
 * The recovery rate k = −ln(AR1)/Δt is only defined for 0 < AR1 < 1; every other case says why.
 */
export type RecoveryRate =
  | { status: 'ok', rate: number }
  | { status: 'not slowing-down compatible', reason: 'ar1 ≤ 0' | 'ar1 ≥ 1' }
  | { status: 'too short', reason: string }
  | { status: 'flat', reason: 'no variation in the window' }

/** Indicators of one window. Moments are of the residuals; CV uses the raw level's mean. */
export interface Indicators {
  n: number
  /** Mean sample spacing in the window (s), the Δt of the recovery rate. */
  dt: number
  variance: number
  sd: number
  /** sd / |mean raw level|; null when the raw level's mean is 0. */
  cv: number | null
  /** NIST lag-1 autocorrelation r₁ = Σd_i·d_{i−1} / Σd². NaN only when the window is flat. */
  ar1: number
  recovery: RecoveryRate
  /** Fisher–Pearson g₁ = m₃/m₂^{3/2} (m_j = Σd^j/n). NaN only when the window is flat. */
  skewness: number
  /** b₂ = m₄/m₂² (normal = 3). NaN only when the window is flat. */
  kurtosis: number
  /** g₂ = b₂ − 3. */
  excessKurtosis: number
}

/** Which quality check failed. */
export type QualityCheck = 'too few samples' | 'gap' | 'stuck' | 'quantized' | 'compressed'

export type QualityVerdict =
  | { ok: true }
  | { ok: false, failed: QualityCheck, reason: string }

/** Limits of the quality gate (docs/science.md §S2.1). */
export interface QualityLimits {
  minSamples: number
  /** Largest allowed spacing between consecutive samples, seconds. */
  maxGapSeconds: number
  /** Fewer distinct values than this is treated as quantized to a few levels. */
  minDistinctLevels: number
  /** The SD must be at least this many quantization steps (A5 item 7 suggests 2). */
  minSdInSteps: number
  /** Longest allowed run of identical consecutive values, as a fraction of the window. */
  maxRepeatFraction: number
  /** Largest allowed fraction of interior points lying exactly on the line through their neighbours. */
  maxCollinearFraction: number
}
