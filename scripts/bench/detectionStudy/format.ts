// Text formatting of the benchmark tables: fixed-width columns, rates with their Wilson
// intervals, AUCs with an approximate 95% interval.
import type { Auc, Rate } from './stats'

/** "k/n p% [lo–hi]" with the Wilson 95% interval in percent. */
export function formatRate(r: Rate | null): string {
  if (!r) return '—'
  if (r.trials === 0) return '0/0'
  const pct = (x: number) => Math.round(100 * x)
  return `${r.hits}/${r.trials} ${pct(r.hits / r.trials)}% [${pct(r.low)}–${pct(r.high)}]`
}

/** AUC with ±1.96 Hanley–McNeil SE, clipped to [0, 1]. */
export function formatAuc(a: Auc): string {
  if (!Number.isFinite(a.auc)) return 'n/a'
  const lo = Math.max(0, a.auc - 1.96 * a.se)
  const hi = Math.min(1, a.auc + 1.96 * a.se)
  return `${a.auc.toFixed(2)} [${lo.toFixed(2)}–${hi.toFixed(2)}]`
}

export function formatNumber(x: number, digits = 0): string {
  return Number.isFinite(x) ? x.toFixed(digits) : '—'
}

/** Prints a title, a header row and rows, every column padded to its widest cell. */
export function printTable(title: string, header: readonly string[], rows: readonly (readonly string[])[]): void {
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map(r => (r[c] ?? '').length)))
  const line = (cells: readonly string[]) => '  ' + cells.map((cell, c) => cell.padEnd(widths[c]!)).join('  ').trimEnd()
  console.log(`\n${title}`)
  console.log(line(header))
  for (const row of rows) console.log(line(row))
}
