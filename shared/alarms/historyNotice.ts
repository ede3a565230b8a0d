// Alarms raised from old history (docs/design.md §D4 item 5): samples back-filled by a gateway
// that was cut off, or uploaded from a historian, complete alarm conditions hours after the fact.
// Those alarms are recorded in full — history, charts, replay — but a page or mail about a
// condition hours old would only bury the live ones, so they get no mail of their own: each
// site's are gathered into one history summary.

/** Default: an activation more than this old when it is recorded came from old history. */
export const DEFAULT_NOTIFY_MAX_AGE_MINUTES = 30

/** How long the history summary collects before it is sent (a back-fill spans several ticks). */
export const HISTORY_SUMMARY_COLLECT_SECONDS = 60

/** Whether an activation at `activationMs`, recorded at `nowMs`, came from old history. */
export function isFromOldHistory(activationMs: number, nowMs: number, maxAgeMinutes: number): boolean {
  return nowMs - activationMs > maxAgeMinutes * 60_000
}
