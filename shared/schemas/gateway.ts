import { z } from 'zod'

export const gatewayCreateSchema = z.object({
  siteId: z.coerce.number({ invalid_type_error: 'must be a site id' }).int().positive('must be a site id'),
  name: z.string({ required_error: 'is required' }).trim().min(2, 'must have at least 2 characters').max(80, 'must have at most 80 characters'),
})

export const idParamsSchema = z.object({
  id: z.coerce.number({ invalid_type_error: 'must be a number' }).int().positive('must be a positive id'),
})
