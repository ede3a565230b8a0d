import type { H3Event } from 'h3'

/** 401 unless the request carries `Authorization: Bearer <key>` of a gateway that is not revoked. */
export async function requireGateway(event: H3Event) {
  const header = getRequestHeader(event, 'authorization') ?? ''
  const match = /^Bearer\s+(\S+)$/i.exec(header)
  if (!match) throw createError({ statusCode: 401, message: 'Authorization: Bearer <ingest key> is required' })
  const gateway = await findGatewayByKey(useDb(), match[1]!)
  if (!gateway) throw createError({ statusCode: 401, message: 'Ingest key is unknown or revoked' })
  return gateway
}
