import { join } from 'node:path'
import { ensureMigrated } from './0.migrate'
import { OpcuaSupervisor } from '../services/opcua/supervisor'

// The OPC UA collector runs in every server instance (each connection is owned by one of them).
// Under NODE_ENV=test it is off, so test files that do not read OPC UA never start clients; the
// OPC UA tests switch it on with BRINKLINE_OPCUA_COLLECTOR=1. BRINKLINE_OPCUA_COLLECTOR=0 turns
// it off anywhere (an instance that should only answer requests).
export default defineNitroPlugin((nitroApp) => {
  const flag = process.env.BRINKLINE_OPCUA_COLLECTOR
  if (flag === '0' || (process.env.NODE_ENV === 'test' && flag !== '1')) return
  const supervisor = new OpcuaSupervisor(useDb(), {
    pollMs: Number(process.env.BRINKLINE_OPCUA_POLL_MS ?? 5_000),
    maxBackoffMs: Number(process.env.BRINKLINE_OPCUA_MAX_BACKOFF_MS ?? 30_000),
    pkiDir: process.env.BRINKLINE_OPCUA_PKI_DIR || join(process.cwd(), '.data', 'opcua-pki'),
    ready: ensureMigrated,
  })
  supervisor.start()
  nitroApp.hooks.hook('close', () => supervisor.stop())
})
