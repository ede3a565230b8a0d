// CSV of what a chart stack shows: one row per time, one column per series, times in ISO 8601 UTC.
// Numbers are written in full precision (no display rounding), empty where a series has no value.

export interface CsvColumn { name: string, values: readonly (number | null)[] }

const quote = (text: string) => (/[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text)

/** Rows whose time lies in [from, to] (all rows when no range is given). */
export function seriesCsv(time: readonly number[], columns: readonly CsvColumn[], range?: [number, number] | null): string {
  const header = ['time_utc', ...columns.map(c => c.name)].map(quote).join(',')
  const rows: string[] = [header]
  time.forEach((t, i) => {
    if (range && (t < range[0] || t > range[1])) return
    if (columns.every(c => c.values[i] === null || c.values[i] === undefined)) return
    const cells = columns.map(c => (c.values[i] === null || c.values[i] === undefined ? '' : String(c.values[i])))
    rows.push([new Date(t * 1000).toISOString(), ...cells].join(','))
  })
  return `${rows.join('\n')}\n`
}
