// Where a chart of a spread measure (variance, residuals) stops its y axis. A trip, a reset or a
// runaway makes variance jump tens of times above anything before it, and a linear axis scaled to
// that spike flattens the slow pre-tip rise the chart exists to show. The axis is therefore capped
// a few times above the upper quartile, which a rise of 2–5× before the tip stays under, and the
// chart says how many points it left above the cap.

/** How far above the upper quartile the axis reaches before it clips. */
export const CEILING_OVER_UPPER_QUARTILE = 4

export interface AxisCeiling {
  value: number
  /** Points of the series above the ceiling (drawn clipped at it). */
  above: number
}

/** Ceiling for |value|; null when nothing needs clipping (or too few points to judge). */
export function axisCeiling(values: readonly (number | null)[], minPoints = 20): AxisCeiling | null {
  const finite = values.filter((v): v is number => v !== null && Number.isFinite(v)).map(Math.abs).sort((a, b) => a - b)
  if (finite.length < minPoints) return null
  const upperQuartile = finite[Math.floor(0.75 * (finite.length - 1))]!
  if (!(upperQuartile > 0)) return null
  const ceiling = CEILING_OVER_UPPER_QUARTILE * upperQuartile
  const above = finite.filter(v => v > ceiling).length
  return above > 0 ? { value: ceiling, above } : null
}
