import { idParamsSchema } from '#shared/schemas/fields'
import { gatewayRotateSchema } from '#shared/schemas/gateway'
import { rotateGatewayKey } from '../../../../services/gateways/keyRotation'

// A new key, shown once; the old one keeps working for the grace period, then stops.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  const { graceMinutes } = await validBody(event, gatewayRotateSchema)
  return useDb().transaction(async (tx) => {
    const rotated = await rotateGatewayKey(tx, id, graceMinutes)
    if (!rotated) throw createError({ statusCode: 404, message: `id: gateway ${id} not found or revoked` })
    await writeAudit(tx, { userId: user.id, action: 'gateway.rotate-key', target: rotated.name, detail: { id, graceMinutes, before: rotated.before, after: rotated.after }, address: clientAddress(event) })
    return { id, name: rotated.name, key: rotated.key, previousKeyExpiresAt: rotated.after.previousKeyExpiresAt }
  })
})
