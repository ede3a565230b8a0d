import { createError } from 'h3'
// Plain errors of the alarm domain; routes turn them into HTTP answers with alarmHttpError.

/** A lifecycle transition the alarm's current state does not allow (a stale or repeated request). */
export class AlarmTransitionRefused extends Error {
  constructor(readonly refusals: { alarmId: number, state: string, label: string, reason: string }[]) {
    super(refusals.map(r => `alarm ${r.alarmId} (${r.label}) is ${r.state.replace(/_/g, ' ')}: ${r.reason}`).join('; '))
  }
}

export class AlarmsNotFound extends Error {
  constructor(readonly ids: number[]) {
    super(`${ids.length === 1 ? 'Alarm' : 'Alarms'} ${ids.join(', ')} not found`)
  }
}

/**
 * A requestId that an earlier acknowledgement by another user, or of other alarms, already
 * carries: not a retry of this request, so answering "replayed" would silently apply nothing.
 */
export class RequestIdReused extends Error {
  constructor() {
    super('requestId: already used by another acknowledgement (another user or other alarms); send a new requestId with a new request')
  }
}

/** 409 for refused transitions and reused request ids, 404 for unknown alarms; anything else is left alone. */
export function alarmHttpError(err: unknown): unknown {
  if (err instanceof AlarmTransitionRefused)
    return createError({ statusCode: 409, message: err.message, data: { refusals: err.refusals } })
  if (err instanceof AlarmsNotFound) return createError({ statusCode: 404, message: err.message })
  if (err instanceof RequestIdReused) return createError({ statusCode: 409, message: err.message })
  return err
}
