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

/** 409 for refused transitions, 404 for unknown alarms; anything else is left alone. */
export function alarmHttpError(err: unknown): unknown {
  if (err instanceof AlarmTransitionRefused)
    return createError({ statusCode: 409, message: err.message, data: { refusals: err.refusals } })
  if (err instanceof AlarmsNotFound) return createError({ statusCode: 404, message: err.message })
  return err
}
