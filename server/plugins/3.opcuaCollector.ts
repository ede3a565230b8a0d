import postgres from 'postgres'
import { ensureMigrated } from './0.migrate'
import { OpcuaSupervisor } from '../services/opcua/supervisor'
import { opcuaPkiDir } from '../services/opcua/plantClient'

// The OPC UA collector runs in every server instance (each connection is owned by one of them)
// unless BRINKLINE_OPCUA_COLLECTOR=0 (server/utils/backgroundWorkers.ts).
export default defineNitroPlugin((nitroApp) => {
  if (!backgroundWorkerOn('BRINKLINE_OPCUA_COLLECTOR')) {
    console.log('[opcua] collector off (BRINKLINE_OPCUA_COLLECTOR=0)')
    return
  }
  const supervisor = new OpcuaSupervisor(useDb(), {
    pollMs: Number(process.env.BRINKLINE_OPCUA_POLL_MS ?? 5_000),
    maxBackoffMs: Number(process.env.BRINKLINE_OPCUA_MAX_BACKOFF_MS ?? 30_000),
    pkiDir: opcuaPkiDir(),
    ready: ensureMigrated,
    // One connection of its own for the ownership locks (supervisor.ts says why not a reserved one).
    lockSql: postgres(databaseUrl(), { max: 1, connect_timeout: 5, idle_timeout: 0, onnotice: () => {} }),
  })
  supervisor.start()
  console.log('[opcua] collector started')
  nitroApp.hooks.hook('close', () => supervisor.stop())
})
