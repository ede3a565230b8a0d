import { and, eq, inArray, sql } from 'drizzle-orm'
import { catalogueUnit } from '#shared/demo/catalogue'
import { DEMO_OPCUA_CONNECTION, DEMO_OPCUA_UNITS, plantNodeId } from '#shared/demo/opcuaDemo'
import { opcuaConnections, opcuaMappings, tags } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'

/**
 * The connection to the simulators' OPC UA server, so the demo's OPC UA units arrive over the
 * protocol a plant would use (docs/opcua.md §O5). Made once with its node table; later starts
 * follow a new endpoint (another port) but leave everything an admin changed, a disabled
 * connection or an edited node table included.
 */
export async function seedDemoOpcuaConnection(tx: DbTransaction, siteId: number, endpointUrl: string): Promise<void> {
  const [existing] = await tx.select().from(opcuaConnections)
    .where(and(eq(opcuaConnections.siteId, siteId), eq(opcuaConnections.name, DEMO_OPCUA_CONNECTION))).for('update')
  if (existing) {
    if (existing.endpointUrl !== endpointUrl)
      await tx.update(opcuaConnections).set({ endpointUrl, configVersion: sql`${opcuaConnections.configVersion} + 1` })
        .where(eq(opcuaConnections.id, existing.id))
    return
  }
  // Every change reported (sampling 0), published each second: the demo tags come every 5 s.
  const [connection] = await tx.insert(opcuaConnections)
    .values({ siteId, name: DEMO_OPCUA_CONNECTION, endpointUrl, samplingIntervalMs: 0, publishingIntervalMs: 1000 }).returning()
  const codes = DEMO_OPCUA_UNITS.flatMap(code => catalogueUnit(code).tags.map(t => t.code))
  const rows = await tx.select({ id: tags.id, code: tags.code }).from(tags).where(and(eq(tags.siteId, siteId), inArray(tags.code, codes)))
  if (rows.length > 0)
    await tx.insert(opcuaMappings).values(rows.map(t => ({
      connectionId: connection!.id, nodeId: plantNodeId(t.code), tagId: t.id, displayName: t.code,
    })))
}
