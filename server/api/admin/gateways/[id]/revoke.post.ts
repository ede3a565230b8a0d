import { idParamsSchema } from '#shared/schemas/fields'
import { keyFacts } from '../../../../services/gateways/keyRotation'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await validParams(event, idParamsSchema)
  return useDb().transaction(async (tx) => {
    const gateway = await revokeGateway(tx, id)
    if (!gateway) throw createError({ statusCode: 404, message: `Gateway ${id} not found or already revoked` })
    await writeAudit(tx, { userId: user.id, action: 'gateway.revoke', target: gateway.name, detail: { id, before: { ...keyFacts(gateway), revokedAt: null }, after: keyFacts(gateway) }, address: clientAddress(event) })
    return { id, revokedAt: gateway.revokedAt }
  })
})
