// The closed sets of the supervisor's review (docs/design.md, incidents): shared by the schema's
// CHECK constraints, the zod contracts and the screens.

/** An incident is worked on while open, examined while under review, and closed with a sign-off. */
export const INCIDENT_STATES = ['open', 'under_review', 'closed'] as const
export type IncidentState = typeof INCIDENT_STATES[number]

export const INCIDENT_STATE_LABELS: Record<IncidentState, string> = {
  open: 'open',
  under_review: 'under review',
  closed: 'closed',
}

/** Allowed moves: forward one step, or back from review to open; a closed incident stays closed. */
export const INCIDENT_MOVES: Record<IncidentState, readonly IncidentState[]> = {
  open: ['under_review'],
  under_review: ['open', 'closed'],
  closed: [],
}

/** How an incident came about: grouped by the system as alarms arrived, or opened by a supervisor. */
export const INCIDENT_ORIGINS = ['automatic', 'manual'] as const
export type IncidentOrigin = typeof INCIDENT_ORIGINS[number]

/**
 * What a supervisor decides about an early-warning alert that no limit alarm followed: `false`
 * (nothing was wrong) or `averted` (the operators acted and the process did not tip).
 */
export const ALERT_OUTCOMES = ['false', 'averted'] as const
export type AlertOutcome = typeof ALERT_OUTCOMES[number]

/** Default gap that still joins alarms into one incident; a site can set its own. */
export const DEFAULT_INCIDENT_WINDOW_S = 30 * 60
export const MAX_INCIDENT_WINDOW_S = 24 * 3600
