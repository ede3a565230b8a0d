// An alarm's condition and its current reading in words (issue 12 item 5): the early-warning
// flag reads "slowing down", not "above 0.5, now 0"; a fold horizon reads as a duration; a
// value carries its engineering unit and, given the tag's range, the tag's decimals (the tile's),
// so a limit and a reading never read "1 pu" beside "0.9988 pu".
import { MEASURE_LABELS } from '../alarms/vocabulary'
import { formatDuration } from './duration'
import { plainNumber, tagDecimals, tagValue } from './numberText'

export interface ConditionFacts {
  measure: string, comparison: string, threshold: number, engineeringUnit?: string | null
  /** The tag's instrument range (null for a unit alarm): value readings take its decimals. */
  rangeLow?: number | null, rangeHigh?: number | null
}

type ValueFormat = Pick<ConditionFacts, 'engineeringUnit' | 'rangeLow' | 'rangeHigh'>

/** What the current reading of the measure says. */
export function measureReading(measure: string, value: number | null | undefined, format: ValueFormat = {}): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—'
  if (measure === 'early_warning') return value >= 0.5 ? 'slowing down' : 'no slowing down'
  if (measure === 'fold_horizon') return Number.isFinite(value) ? `fold in ${formatDuration(value)}` : 'no fold in view'
  if (measure !== 'value') return plainNumber(value)
  const { engineeringUnit, rangeLow, rangeHigh } = format
  const text = typeof rangeLow === 'number' && typeof rangeHigh === 'number' ? tagValue(value, tagDecimals(rangeLow, rangeHigh)) : plainNumber(value)
  return engineeringUnit ? `${text} ${engineeringUnit}` : text
}

/** "value above 400 K", "early-warning decision: slowing down", "fold horizon below 20 min". */
export function conditionText(c: ConditionFacts): string {
  if (c.measure === 'early_warning') return `early-warning decision: ${c.comparison === 'above' ? 'slowing down' : 'not slowing down'}`
  const label = MEASURE_LABELS[c.measure] ?? c.measure.replace(/_/g, ' ')
  if (c.measure === 'fold_horizon') return `fold horizon ${c.comparison} ${formatDuration(c.threshold)}`
  return `${label} ${c.comparison} ${measureReading(c.measure, c.threshold, c)}`
}
