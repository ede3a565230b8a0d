import { z } from 'zod'
import { dbId, textField } from './fields'

export const gatewayCreateSchema = z.object({
  siteId: dbId('site'),
  name: textField().trim().min(2, 'must have at least 2 characters').max(80, 'must have at most 80 characters'),
})

/**
 * How long the replaced key keeps working after a rotation. [common practice] A day by default,
 * enough to reconfigure a remote box on the next shift; 0 stops the old key at once; a week at most.
 */
export const GATEWAY_GRACE_DEFAULT_MINUTES = 24 * 60
export const GATEWAY_GRACE_MAX_MINUTES = 7 * 24 * 60
export const gatewayRotateSchema = z.object({
  graceMinutes: z.number({ invalid_type_error: 'must be a number of minutes' }).int('must be whole minutes')
    .min(0, 'must be 0 or more').max(GATEWAY_GRACE_MAX_MINUTES, `must be at most ${GATEWAY_GRACE_MAX_MINUTES} (7 days)`)
    .default(GATEWAY_GRACE_DEFAULT_MINUTES),
}).strict()
