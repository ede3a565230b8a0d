// The alarm state machine of ANSI/ISA-18.2-2016 (IEC 62682), as summarised in docs/science.md §S7.2:
// A normal → B unacknowledged on activation; B → C acknowledged on acknowledgement; B → D
// returned-to-normal unacknowledged when the condition clears first; C → A on return; D → A on
// acknowledgement. Shelved (F), suppressed by design (G) and out of service (H) can be entered
// from any state; while in them the condition is still tracked, and on exit evaluation resumes
// from normal: a condition that still holds is annunciated again as unacknowledged.
// Pure: the database layer stores what this returns and writes one alarm event per transition.
import { ALARM_STATE_LABELS, type AlarmState, type LifecycleEvent } from './vocabulary'

export interface AlarmPoint {
  state: AlarmState
  /** Whether the alarm condition holds now (independent of acknowledgement and shelving). */
  conditionActive: boolean
}

export type Transition =
  | {
    ok: true
    from: AlarmPoint
    to: AlarmPoint
    /** The point is back to normal: its occurrence is closed. */
    closes: boolean
    /** The point newly demands the operator's attention (a message goes out). */
    annunciates: boolean
  }
  | { ok: false, reason: string }

/** Out-of-annunciation states and the events that enter and leave them. */
const SET_ASIDE: Record<'shelved' | 'suppressed' | 'out_of_service', { enter: LifecycleEvent, exit: LifecycleEvent }> = {
  shelved: { enter: 'shelve', exit: 'unshelve' },
  suppressed: { enter: 'suppress', exit: 'unsuppress' },
  out_of_service: { enter: 'remove_from_service', exit: 'return_to_service' },
}

const isSetAside = (state: AlarmState): state is keyof typeof SET_ASIDE => state in SET_ASIDE

/** Whether an operator may acknowledge an alarm in this state (screens ask before offering it). */
export function canAcknowledge(state: AlarmState): boolean {
  return applyLifecycleEvent({ state, conditionActive: state === 'unacknowledged' }, 'acknowledge').ok
}

/** Applies one event to a point; an event the state does not allow is refused with a reason. */
export function applyLifecycleEvent(from: AlarmPoint, event: LifecycleEvent): Transition {
  const to = nextPoint(from, event)
  if (typeof to === 'string') return { ok: false, reason: to }
  return {
    ok: true,
    from,
    to,
    closes: to.state === 'normal',
    annunciates: to.state === 'unacknowledged' && from.state !== 'unacknowledged',
  }
}

function nextPoint(from: AlarmPoint, event: LifecycleEvent): AlarmPoint | string {
  const { state } = from
  const label = ALARM_STATE_LABELS[state]
  const entered = (Object.entries(SET_ASIDE) as [keyof typeof SET_ASIDE, { enter: LifecycleEvent, exit: LifecycleEvent }][])
    .find(([, e]) => e.enter === event)
  if (entered) {
    return state === entered[0] ? `the alarm is already ${label}` : { state: entered[0], conditionActive: from.conditionActive }
  }
  const exited = (Object.entries(SET_ASIDE) as [keyof typeof SET_ASIDE, { enter: LifecycleEvent, exit: LifecycleEvent }][])
    .find(([, e]) => e.exit === event)
  if (exited) {
    if (state !== exited[0]) return `the alarm is ${label}, not ${ALARM_STATE_LABELS[exited[0]]}`
    return resume(from.conditionActive)
  }
  switch (event) {
    case 'activate':
      if (isSetAside(state)) return { state, conditionActive: true }
      if (state === 'normal' || state === 'rtn_unacknowledged') return { state: 'unacknowledged', conditionActive: true }
      return `the alarm condition is already active (${label})`
    case 'return':
      if (isSetAside(state)) return { state, conditionActive: false }
      if (state === 'unacknowledged') return { state: 'rtn_unacknowledged', conditionActive: false }
      if (state === 'acknowledged') return { state: 'normal', conditionActive: false }
      return `the alarm condition is not active (${label})`
    case 'acknowledge':
      if (state === 'unacknowledged') return { state: 'acknowledged', conditionActive: true }
      if (state === 'rtn_unacknowledged') return { state: 'normal', conditionActive: false }
      return `only an unacknowledged alarm can be acknowledged; this one is ${label}`
  }
  return `unknown event ${event}`
}

/** Leaving F, G or H: back to normal, then an active condition is annunciated again. */
function resume(conditionActive: boolean): AlarmPoint {
  return conditionActive ? { state: 'unacknowledged', conditionActive: true } : { state: 'normal', conditionActive: false }
}
