// Puts a unit's tags on one time grid for the VAR(1) slow-mode fit (docs/science.md §S5), which needs
// the tags sampled together: each tag's last sample in every cell of the coarsest sample period.
// The unit page's chart fills its grid differently (shared/utils/unitSlowMode.ts says why).

export interface TagSeries {
  times: ArrayLike<number>
  values: ArrayLike<number>
}

/**
 * Cells of width `step` seconds ending at `end`; a cell is kept only when every tag has a sample
 * in it. Returns the cell end times and one aligned series per tag.
 */
export function alignOnGrid(
  series: readonly TagSeries[], end: number, step: number, cells: number,
): { times: number[], values: number[][] } {
  const start = end - cells * step
  const grid = series.map(() => new Float64Array(cells).fill(Number.NaN))
  series.forEach((s, j) => {
    for (let i = 0; i < s.times.length; i++) {
      const cell = Math.ceil((s.times[i]! - start) / step) - 1
      if (cell >= 0 && cell < cells) grid[j]![cell] = s.values[i]!
    }
  })
  const times: number[] = []
  const values: number[][] = series.map(() => [])
  for (let c = 0; c < cells; c++) {
    if (grid.some(g => Number.isNaN(g[c]!))) continue
    times.push(start + (c + 1) * step)
    grid.forEach((g, j) => values[j]!.push(g[c]!))
  }
  return { times, values }
}
