import { z } from 'zod'

/** How long a site may keep raw samples, in days (a decade at most: the archive keeps the rest). */
export const RAW_RETENTION_DAYS = { min: 1, max: 3650 } as const

export const retentionUpdateSchema = z.object({
  rawRetentionDays: z.number({ invalid_type_error: 'must be a whole number of days or null' })
    .int('must be a whole number of days')
    .min(RAW_RETENTION_DAYS.min, `must be at least ${RAW_RETENTION_DAYS.min} day`)
    .max(RAW_RETENTION_DAYS.max, `must be at most ${RAW_RETENTION_DAYS.max} days`)
    .nullable(),
}).strict()
export type RetentionUpdate = z.infer<typeof retentionUpdateSchema>
