// Refusals of the plant model, each naming the field it is about; routes map them with plantHttpError.
import { createError } from 'h3'
import { sqlState, UNIQUE_VIOLATION } from '../../utils/pgErrors'

/** The request names something that does not fit (a retired unit, a loop tag on another site): 400. */
export class PlantInputRefused extends Error {
  constructor(readonly field: string, reason: string) {
    super(`${field}: ${reason}`)
  }
}

/** The change conflicts with the plant's current state (a duplicate code, live children): 409. */
export class PlantConflict extends Error {}

/** A code already taken (the unique index refused it) becomes a conflict naming code; anything else passes on. */
export function refuseDuplicateCode(err: unknown, message: string): never {
  if (sqlState(err) === UNIQUE_VIOLATION) throw new PlantConflict(`code: ${message}`)
  throw err
}

export function plantHttpError(err: unknown): unknown {
  if (err instanceof PlantInputRefused) return createError({ statusCode: 400, message: err.message })
  if (err instanceof PlantConflict) return createError({ statusCode: 409, message: err.message })
  return err
}
