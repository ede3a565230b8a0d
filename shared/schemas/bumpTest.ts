import { z } from 'zod'
import { textField } from './fields'
import { parseWallClock } from '../utils/zonedTime'

/** The longest response a bump test may be fitted over. */
export const MAX_RESPONSE_S = 86_400

export const bumpTestCreateSchema = z.object({
  /** Plant-local wall-clock time of the step, "YYYY-MM-DD HH:MM[:SS]" (the site's zone). */
  stepTime: textField().trim()
    .refine(s => parseWallClock(s) !== null, 'must be a plant-local date and time like 2026-07-06 10:00:00'),
  stepSize: z.number({ required_error: 'is required', invalid_type_error: 'must be a number' }).finite('must be finite')
    .refine(x => x !== 0, 'must not be 0'),
  responseS: z.number({ required_error: 'is required', invalid_type_error: 'must be a number of seconds' }).finite()
    .positive('must be more than 0 s').max(MAX_RESPONSE_S, `must be at most ${MAX_RESPONSE_S} s (a day)`),
  note: textField().trim().max(500, 'must have at most 500 characters').default(''),
}).strict()
export type BumpTestCreate = z.infer<typeof bumpTestCreateSchema>
