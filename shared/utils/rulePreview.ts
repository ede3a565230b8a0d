// What a rule would have done over past data, and the warnings the rules editor shows:
// chattering, flooding, and a priority spread far from the usual split.
import { INACTIVE, maxActivationsWithin, stepCondition, type ConditionSettings } from '../alarms/conditionTracker'
import { FLOOD_THRESHOLD, FLOOD_WINDOW_MINUTES } from '../alarms/flood'
import type { Priority } from '../alarms/vocabulary'

/** Chattering: three or more activations within 60 s (EEMUA 191 / ISA-18.2 bad-actor lists [common practice]). */
export const CHATTER = { activations: 3, windowS: 60 } as const
/** Alarm priorities usually split about 80 % low, 15 % medium, 5 % high (EEMUA 191, ISA-18.2 [common practice]). */
export const PRIORITY_TARGET = { low: 0.8, medium: 0.15, high: 0.05 } as const
/** How far a share may stray from its target before the editor says so. */
export const PRIORITY_TOLERANCE = 0.1

/** Times (s) at which a rule on raw values would have raised, through the live condition tracker. */
export function valueActivations(times: ArrayLike<number>, values: ArrayLike<number>, condition: ConditionSettings): number[] {
  let state = INACTIVE
  const raised: number[] = []
  for (let i = 0; i < times.length; i++) {
    const step = stepCondition(condition, state, times[i]!, values[i]!)
    state = step.state
    if (step.change === 'activate') raised.push(times[i]!)
  }
  return raised
}

export interface FiringSummary {
  count: number
  perDay: number
  /** Most activations within CHATTER.windowS, and within the flood window. */
  maxInChatterWindow: number
  maxInFloodWindow: number
  chatter: boolean
  flood: boolean
}

export function firingSummary(activations: readonly number[], spanS: number): FiringSummary {
  const maxInChatterWindow = maxActivationsWithin(activations, CHATTER.windowS)
  const maxInFloodWindow = maxActivationsWithin(activations, FLOOD_WINDOW_MINUTES * 60)
  return {
    count: activations.length,
    perDay: spanS > 0 ? activations.length / (spanS / 86_400) : 0,
    maxInChatterWindow,
    maxInFloodWindow,
    chatter: maxInChatterWindow >= CHATTER.activations,
    // One rule that alone raises more than a flood's worth in the flood window floods the operator.
    flood: maxInFloodWindow > FLOOD_THRESHOLD,
  }
}

export interface PrioritySpread {
  counts: Record<keyof typeof PRIORITY_TARGET, number>
  shares: Record<keyof typeof PRIORITY_TARGET, number>
  /** A sentence for each share that strays more than PRIORITY_TOLERANCE from its target. */
  departures: string[]
}

/** The spread of alarm (not alert) priorities; urgent counts with high, as the top of the split. */
export function prioritySpread(priorities: readonly Priority[]): PrioritySpread {
  const counts = { low: 0, medium: 0, high: 0 }
  for (const p of priorities) counts[p === 'urgent' ? 'high' : p]++
  const n = priorities.length
  const shares = { low: n ? counts.low / n : 0, medium: n ? counts.medium / n : 0, high: n ? counts.high / n : 0 }
  const departures = n === 0
    ? []
    : (Object.keys(PRIORITY_TARGET) as (keyof typeof PRIORITY_TARGET)[])
        .filter(k => Math.abs(shares[k] - PRIORITY_TARGET[k]) > PRIORITY_TOLERANCE)
        .map(k => `${k === 'high' ? 'high and urgent' : k} priority: ${Math.round(shares[k] * 100)}% of ${n} alarm rules, usually about ${PRIORITY_TARGET[k] * 100}%`)
  return { counts, shares, departures }
}
