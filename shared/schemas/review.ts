import { z } from 'zod'
import { dbId, timeField } from './fields'

const DAY_MS = 86_400_000
/** Longest health period: a quarter, so a report is at most ~13,000 ten-minute periods. */
export const MAX_HEALTH_DAYS = 92

/**
 * Alarm-system health over [from, to) for one site (one operator position). Without times the
 * last 7 days; without a site the only site (siteId is then required when there are several).
 */
export const healthQuerySchema = z.object({
  siteId: dbId('site').optional(),
  from: timeField().optional(),
  to: timeField().optional(),
}).transform((q) => {
  const to = q.to ?? new Date()
  const from = q.from ?? new Date(to.getTime() - 7 * DAY_MS)
  return { siteId: q.siteId, from, to }
}).superRefine((q, ctx) => {
  if (!(q.from < q.to)) ctx.addIssue({ code: 'custom', path: ['to'], message: 'must be after from' })
  else if (q.to.getTime() - q.from.getTime() > MAX_HEALTH_DAYS * DAY_MS)
    ctx.addIssue({ code: 'custom', path: ['from'], message: `must be at most ${MAX_HEALTH_DAYS} days before to` })
})
export type HealthQuery = z.output<typeof healthQuerySchema>
