import { z } from 'zod'
import { dbId } from '#shared/schemas/fields'

const querySchema = z.object({ siteId: dbId('site').optional() })

export default defineEventHandler(async (event) => {
  await requireCapability(event, 'view')
  const { siteId } = await validQuery(event, querySchema)
  return reviewSettings(useDb(), siteId).catch((err) => { throw reviewHttpError(err) })
})
