import { plantEndpointUrl } from '#shared/demo/opcuaDemo'
import { ensureMigrated } from './0.migrate'

function demoOpcuaEndpoint(): string | undefined {
  const port = Number(process.env.BRINKLINE_DEMO_OPCUA_PORT)
  return Number.isInteger(port) && port > 0 && port < 65536 ? plantEndpointUrl(port) : undefined
}

// The demo site is seeded by the start command and the tests (BRINKLINE_SEED_DEMO=1), never in
// production. Its password comes from the environment; the fallback is a development default.
// The start command also gives the port of the simulators' OPC UA server (BRINKLINE_DEMO_OPCUA_PORT),
// so the seed connects to it; the tests leave it out and get no such connection.
export default defineNitroPlugin((nitroApp) => {
  if (process.env.BRINKLINE_SEED_DEMO !== '1') return
  const password = process.env.BRINKLINE_DEMO_PASSWORD || 'brinkline-demo'
  const seeded = ensureMigrated()
    .then(() => seedDemo(useDb(), password, hashPassword, process.env.BRINKLINE_SIM_KEY, demoOpcuaEndpoint()))
    .then(() => console.log('[seed] demo site ready'), err => console.error('[seed] failed:', err.message))
  // Nitro does not await plugins: without this, a sign-in arriving in the first second of a
  // fresh demo answers 401 because the demo users are not there yet.
  nitroApp.hooks.hook('request', async (event) => {
    if (event.path.startsWith('/api/')) await seeded
  })
})
