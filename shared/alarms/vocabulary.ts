// The closed sets of the alarm system, shared by the database schema, the zod contracts, the
// pipeline and the screens (names from docs/design.md §D3 and ISA-18.2 / IEC 62682 terms).

/** Most urgent first: the order the active list sorts by. */
export const PRIORITIES = ['urgent', 'high', 'medium', 'low'] as const
export type Priority = typeof PRIORITIES[number]

/** 0 = most urgent, for sorting and "at least this priority" comparisons. */
export const priorityRank = (p: Priority): number => PRIORITIES.indexOf(p)

/**
 * `alarm`: an operator must act. `alert`: an advisory notification below the alarm level
 * (ISA-18.2-2016), shown and counted separately so early warnings never spoil alarm-rate figures.
 */
export const ALARM_CLASSES = ['alarm', 'alert'] as const
export type AlarmClass = typeof ALARM_CLASSES[number]

/** ISA-18.2 alarm states A–D and F–H (docs/science.md §S7.2); the optional latched state E is not used. */
export const ALARM_STATES = [
  'normal', 'unacknowledged', 'acknowledged', 'rtn_unacknowledged', 'shelved', 'suppressed', 'out_of_service',
] as const
export type AlarmState = typeof ALARM_STATES[number]

export const ALARM_STATE_LABELS: Record<AlarmState, string> = {
  normal: 'normal',
  unacknowledged: 'unacknowledged',
  acknowledged: 'acknowledged',
  rtn_unacknowledged: 'returned to normal, unacknowledged',
  shelved: 'shelved',
  suppressed: 'suppressed by design',
  out_of_service: 'out of service',
}

/**
 * The events that move an alarm between those states (shared/alarms/lifecycle.ts): not a second
 * list of states, though ISA-18.2 names some states after the event that enters them (shelved).
 */
export const LIFECYCLE_EVENTS = [
  'activate', 'return', 'acknowledge', 'shelve', 'unshelve', 'suppress', 'unsuppress',
  'remove_from_service', 'return_to_service',
] as const
export type LifecycleEvent = typeof LIFECYCLE_EVENTS[number]

/** How each event reads in an alarm's trail ("activated" is "activated again" after the first). */
export const LIFECYCLE_EVENT_LABELS: Record<LifecycleEvent, string> = {
  activate: 'activated',
  return: 'returned to normal',
  acknowledge: 'acknowledged',
  shelve: 'shelved',
  unshelve: 'unshelved',
  suppress: 'suppressed by design',
  unsuppress: 'suppression ended',
  remove_from_service: 'removed from service',
  return_to_service: 'returned to service',
}

/** How a rule's alarm point is kept in or out of annunciation by configuration. */
export const RULE_MODES = ['in_service', 'suppressed', 'out_of_service'] as const
export type RuleMode = typeof RULE_MODES[number]

/**
 * What a rule watches. `value` is the raw sample (plain high/low limits); the indicators are
 * those of the latest window; `p_ar1` / `p_variance` the surrogate p-values of their trends;
 * `fold_horizon` the projected seconds to the fold (no fold in view counts as infinitely far);
 * `early_warning` is 1 while the engine's decision is "slowing down", else 0. A unit rule
 * watches the unit's slow-mode recovery rate.
 */
export const TAG_MEASURES = [
  'value', 'variance', 'std', 'cv', 'ar1', 'recovery_rate', 'skewness', 'kurtosis',
  'p_ar1', 'p_variance', 'fold_horizon', 'early_warning',
] as const
export const UNIT_MEASURES = ['recovery_rate'] as const
export type TagMeasure = typeof TAG_MEASURES[number]
export type RuleMeasure = TagMeasure

export const COMPARISONS = ['above', 'below'] as const
export type Comparison = typeof COMPARISONS[number]

export const TARGET_KINDS = ['tag', 'unit'] as const
export type TargetKind = typeof TARGET_KINDS[number]

/** Where a replay of stored history stands (docs/design.md §D4 replay): queued, running, then done or failed. */
export const REPLAY_STATES = ['queued', 'running', 'done', 'failed'] as const
export type ReplayState = typeof REPLAY_STATES[number]
/** A replay runs on the tag's stored history or on a historian file uploaded for it. */
export const REPLAY_SOURCES = ['history', 'upload'] as const
export type ReplaySource = typeof REPLAY_SOURCES[number]

/** Tile status of a tag (docs/design.md §D3), most severe first after the data problems. */
export const TAG_STATUSES = ['steady', 'watch', 'warning', 'alarm', 'no data', 'bad quality'] as const
export type TagStatus = typeof TAG_STATUSES[number]

/** The caution every alarm message and e-mail carries (docs/design.md §D1). */
export const ADVISORY_CAUTION = 'Advisory only: Brinkline never writes to a control system. '
  + 'Follow the plant\'s operating procedures and the instructions of the responsible authority.'

/** What each rule measure is, in words (mail, alarm lists, the alarm page). */
export const MEASURE_LABELS: Record<string, string> = {
  value: 'value',
  variance: 'variance',
  std: 'standard deviation',
  cv: 'coefficient of variation',
  ar1: 'lag-1 autocorrelation',
  recovery_rate: 'recovery rate (1/s)',
  skewness: 'skewness',
  kurtosis: 'kurtosis',
  p_ar1: 'p-value of the autocorrelation trend',
  p_variance: 'p-value of the variance trend',
  fold_horizon: 'fold horizon (s)',
  early_warning: 'early-warning decision (1 = slowing down)',
}
