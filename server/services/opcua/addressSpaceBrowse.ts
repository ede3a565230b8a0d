import { createError } from 'h3'
import { BrowseDirection, NodeClass, NodeClassMask, resolveNodeId, StatusCodes, type ClientSession, type ReferenceDescription } from 'node-opcua-client'
import type { CollectorConfig } from './connectionRecords'
import { createPlantClient, userIdentityOf } from './plantClient'
import type { BrowsedNode } from '#shared/opcua/browsedNode'
import { readVariableFacts } from './variableFacts'

// The admin's look into a plant server's address space, to pick the variables a connection reads
// (issue 17). Read-only by construction: a session, Browse, BrowseNext and Read, nothing else.

/** Where a browse starts when no node is given: the Objects folder (IEC 62541-5 §8.2.4, ns=0;i=85). */
export const OBJECTS_FOLDER = 'ns=0;i=85'
/** A server that does not answer in this time is reported unreachable, so the page does not hang. */
const BROWSE_TIMEOUT_MS = 20_000

type BrowseTarget = Pick<CollectorConfig, 'endpointUrl' | 'securityMode' | 'securityPolicy' | 'username' | 'passwordSecret'>

/** The objects and variables one hierarchical step below `nodeId` on the connection's server. */
export async function browseChildren(config: BrowseTarget, pkiDir: string, nodeId = OBJECTS_FOLDER): Promise<BrowsedNode[]> {
  try {
    resolveNodeId(nodeId)
  }
  catch {
    throw createError({ statusCode: 400, message: 'nodeId: must be an OPC UA node id such as ns=2;s=Boiler.TI-401' })
  }
  const client = createPlantClient(config, pkiDir, 'Brinkline address-space browse')
  let timer: ReturnType<typeof setTimeout> | undefined
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${BROWSE_TIMEOUT_MS / 1000} s`)), BROWSE_TIMEOUT_MS)
  })
  try {
    return await Promise.race([browseWith(client, config, nodeId), timeout])
  }
  catch (err) {
    if ((err as { statusCode?: number }).statusCode) throw err
    // The stored endpoint does not answer (or refuses us): the admin's setting to check, so a 4xx naming it.
    throw createError({ statusCode: 422, message: `endpointUrl: ${config.endpointUrl} could not be browsed: ${(err as Error).message.slice(0, 300)}` })
  }
  finally {
    clearTimeout(timer)
    await client.disconnect().catch(() => {})
  }
}

async function browseWith(client: ReturnType<typeof createPlantClient>, config: BrowseTarget, nodeId: string): Promise<BrowsedNode[]> {
  await client.connect(config.endpointUrl)
  const session = await client.createSession(userIdentityOf(config))
  try {
    let result = await session.browse({
      nodeId, browseDirection: BrowseDirection.Forward, referenceTypeId: 'HierarchicalReferences', includeSubtypes: true,
      nodeClassMask: NodeClassMask.Object | NodeClassMask.Variable, resultMask: 0x3f,
    })
    if (result.statusCode.equals(StatusCodes.BadNodeIdUnknown) || result.statusCode.equals(StatusCodes.BadNodeIdInvalid))
      throw createError({ statusCode: 400, message: `nodeId: the server has no node ${nodeId}` })
    if (result.statusCode.isNotGood()) throw new Error(`Browse answered ${result.statusCode.name}`)
    const references: ReferenceDescription[] = [...(result.references ?? [])]
    while (result.continuationPoint && result.continuationPoint.length > 0) {
      result = await session.browseNext(result.continuationPoint, false)
      references.push(...(result.references ?? []))
    }
    return await describe(session, references)
  }
  finally {
    await session.close().catch(() => {})
  }
}

async function describe(session: ClientSession, references: ReferenceDescription[]): Promise<BrowsedNode[]> {
  const variables = references.filter(r => r.nodeClass === NodeClass.Variable).map(r => r.nodeId.toString())
  const facts = await readVariableFacts(session, variables)
  return references.map((r) => {
    const nodeId = r.nodeId.toString()
    const isVariable = r.nodeClass === NodeClass.Variable
    return {
      nodeId,
      browseName: r.browseName.toString(),
      displayName: r.displayName.text ?? r.browseName.name ?? '',
      nodeClass: isVariable ? 'Variable' as const : 'Object' as const,
      facts: isVariable ? facts.get(nodeId) ?? null : null,
    }
  })
}
