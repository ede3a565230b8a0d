// When a rule's condition counts as active: the generic alarm logic of docs/science.md §S7.3 — activate
// when x ≥ H has held for the on-delay, clear when x < H − deadband has held for the off-delay
// (mirrored for a low limit). Deadband and delays are what stop a noisy signal near its limit
// from chattering. Pure: the pipeline stores the state between ticks.

export interface ConditionSettings {
  comparison: 'above' | 'below'
  threshold: number
  deadband: number
  onDelayS: number
  offDelayS: number
}

export interface ConditionState {
  active: boolean
  /** Time (s) the condition started holding while inactive; null when it does not hold. */
  pendingSince: number | null
  /** Time (s) the value went beyond the deadband while active; null when it has not. */
  clearingSince: number | null
}

export const INACTIVE: ConditionState = Object.freeze({ active: false, pendingSince: null, clearingSince: null })

export interface ConditionStep {
  state: ConditionState
  change: 'activate' | 'return' | null
}

/**
 * Feeds one observation (time in seconds, observations in time order). A NaN value (no
 * observation, a window that failed the quality gate) changes nothing: missing data neither
 * raises nor clears an alarm.
 */
export function stepCondition(settings: ConditionSettings, state: ConditionState, time: number, value: number): ConditionStep {
  if (Number.isNaN(value)) return { state, change: null }
  const above = settings.comparison === 'above'
  if (!state.active) {
    const holds = above ? value >= settings.threshold : value <= settings.threshold
    if (!holds) return { state: { ...state, pendingSince: null }, change: null }
    const since = state.pendingSince ?? time
    if (time - since >= settings.onDelayS) return { state: { active: true, pendingSince: null, clearingSince: null }, change: 'activate' }
    return { state: { ...state, pendingSince: since }, change: null }
  }
  const beyond = above ? value < settings.threshold - settings.deadband : value > settings.threshold + settings.deadband
  if (!beyond) return { state: { ...state, clearingSince: null }, change: null }
  const since = state.clearingSince ?? time
  if (time - since >= settings.offDelayS) return { state: { active: false, pendingSince: null, clearingSince: null }, change: 'return' }
  return { state: { ...state, clearingSince: since }, change: null }
}

/** The largest number of activation times falling within any span of `windowS` seconds. */
export function maxActivationsWithin(times: readonly number[], windowS: number): number {
  const sorted = [...times].sort((a, b) => a - b)
  let most = 0
  for (let start = 0, end = 0; end < sorted.length; end++) {
    while (sorted[end]! - sorted[start]! > windowS) start++
    most = Math.max(most, end - start + 1)
  }
  return most
}
