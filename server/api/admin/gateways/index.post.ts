import { gatewayCreateSchema } from '#shared/schemas/gateway'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const input = await validBody(event, gatewayCreateSchema)
  const created = await useDb().transaction(async (tx) => {
    const result = await createGateway(tx, input).catch((err) => {
      if (sqlState(err) === UNIQUE_VIOLATION)
        throw createError({ statusCode: 409, message: `name: a gateway called "${input.name}" already exists on this site` })
      if (sqlState(err) === FOREIGN_KEY_VIOLATION)
        throw createError({ statusCode: 400, message: `siteId: site ${input.siteId} does not exist` })
      throw err
    })
    await writeAudit(tx, { userId: user.id, action: 'gateway.create', target: input.name, detail: { id: result.gateway.id, before: null, after: { name: input.name, siteId: input.siteId, keyPrefix: result.gateway.keyPrefix } }, address: clientAddress(event) })
    return result
  })
  setResponseStatus(event, 201)
  // The key is shown this once; only its hash is stored.
  return { id: created.gateway.id, name: created.gateway.name, key: created.key }
})
