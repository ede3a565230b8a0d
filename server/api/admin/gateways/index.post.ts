import { gatewayCreateSchema } from '#shared/schemas/gateway'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const input = await validBody(event, gatewayCreateSchema)
  const created = await useDb().transaction(async (tx) => {
    const result = await createGateway(tx, input).catch((err) => {
      throw constraintHttpError(err, {
        duplicate: `name: a gateway called "${input.name}" already exists on this site`,
        missingReference: `siteId: site ${input.siteId} does not exist`,
      })
    })
    await writeAudit(tx, { userId: user.id, action: 'gateway.create', target: input.name, detail: { id: result.gateway.id, before: null, after: { name: input.name, siteId: input.siteId, keyPrefix: result.gateway.keyPrefix } }, address: clientAddress(event) })
    return result
  })
  setResponseStatus(event, 201)
  // The key is shown this once; only its hash is stored.
  return { id: created.gateway.id, name: created.gateway.name, key: created.key }
})
