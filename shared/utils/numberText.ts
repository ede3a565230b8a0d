// How numbers read on screens (issue 12 item 5): never in scientific notation (an operator reads
// "0.00012", not "1.20e-4"), the same decimals for every value of one tag, p-values below what
// the tests resolve written as "< 0.001", and 0/1 flags as the words they stand for.

/** `significant` figures, without an exponent at any magnitude; large values grouped in thousands. */
export function plainNumber(value: number | null | undefined, significant = 4): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—'
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞'
  if (value === 0) return '0'
  const magnitude = Math.floor(Math.log10(Math.abs(value)))
  const decimals = Math.min(12, Math.max(0, significant - 1 - magnitude))
  const fixed = Number(value.toFixed(decimals))
  if (Math.abs(fixed) >= 1e6) return Math.round(fixed).toLocaleString('en-US')
  // toFixed keeps trailing zeros ("0.5000"); a plain number drops them.
  return decimals === 0 ? fixed.toFixed(0) : value.toFixed(decimals).replace(/\.?0+$/, '')
}

/**
 * Decimals for every value of a tag, from its instrument range: four significant figures of the
 * span, so 0–1.2 pu reads "0.999" and "1.000" alike, and 250–450 K reads "350.2".
 */
export function tagDecimals(rangeLow: number, rangeHigh: number): number {
  const span = Math.abs(rangeHigh - rangeLow)
  if (!(span > 0) || !Number.isFinite(span)) return 2
  return Math.min(6, Math.max(0, 3 - Math.floor(Math.log10(span))))
}

/** A tag's value with the tag's fixed decimals. */
export function tagValue(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  const text = value.toFixed(decimals)
  // "-0.000" is zero.
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text
}

/** "0.04", "0.31"; "< 0.001" below what a surrogate test of a few hundred draws can tell apart. */
export function pValueText(p: number | null | undefined): string {
  if (p === null || p === undefined || Number.isNaN(p)) return '—'
  if (p < 0.001) return '< 0.001'
  return plainNumber(p, 2)
}
