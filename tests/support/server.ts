import { spawn, type ChildProcess } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { createServer } from 'node:net'
import { fileURLToPath } from 'node:url'
import { setup } from '@nuxt/test-utils/e2e'
import postgres from 'postgres'
import { afterAll } from 'vitest'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))

/**
 * A database of this test file's own on the suite's PostgreSQL, so files never see each other's
 * rows (the server migrates and seeds it at start). The test process's NUXT_DATABASE_URL points
 * at it too, as the superuser, for tests/support/db.ts. Under `npm test` (BRINKLINE_DB_ROLES=1,
 * roles made by scripts/pg.sh) the database belongs to brinkline_owner, and the server migrates as
 * that role and serves as brinkline_app, as `npm start` runs it (issue 13 item 8).
 */
async function createFileDatabase(): Promise<Record<string, string>> {
  const suiteUrl = process.env.BRINKLINE_SUITE_DATABASE_URL ?? process.env.NUXT_DATABASE_URL
  if (!suiteUrl) throw new Error('NUXT_DATABASE_URL is not set: run the suite through `npm test`')
  process.env.BRINKLINE_SUITE_DATABASE_URL = suiteUrl
  const name = `brinkline_test_${randomBytes(6).toString('hex')}`
  const roles = process.env.BRINKLINE_DB_ROLES === '1'
  const admin = postgres(suiteUrl, { max: 1, onnotice: () => {} })
  await admin.unsafe(roles ? `create database ${name} owner brinkline_owner` : `create database ${name}`)
  // The replay queue (pg-boss) makes its own schema, as the app role.
  if (roles) await admin.unsafe(`grant create on database ${name} to brinkline_app`)
  await admin.end()
  const as = (user?: string) => {
    const url = new URL(suiteUrl)
    url.pathname = `/${name}`
    if (user) url.username = user
    return url.toString()
  }
  process.env.NUXT_DATABASE_URL = as()
  process.env.DATABASE_URL = as()
  if (!roles) return { NUXT_DATABASE_URL: as() }
  process.env.BRINKLINE_APP_DATABASE_URL = as('brinkline_app')
  return { NUXT_DATABASE_URL: as('brinkline_app'), NUXT_MIGRATION_DATABASE_URL: as('brinkline_owner') }
}

/**
 * Background workers a test server runs only when its test asks (`'1'`): a file that neither reads
 * OPC UA nor replays starts no OPC UA client or queue client (server/utils/backgroundWorkers.ts).
 */
const WORKERS_OFF = { BRINKLINE_OPCUA_COLLECTOR: '0', BRINKLINE_REPLAY_WORKER: '0' }

/**
 * Starts the one build (made by scripts/test.sh) against a fresh database. @nuxt/test-utils runs
 * it with NODE_ENV=production (its own default), so the server cannot tell it is under test:
 * tests that drive the tasks through the test-only task route switch the schedules off
 * (MANUAL_TICKS_ENV), and the background workers are off unless asked for (WORKERS_OFF).
 */
export async function setupBuiltServer(env: Record<string, string> = {}, options: { port?: number } = {}) {
  const databaseEnv = await createFileDatabase()
  fileServerEnv = { ...databaseEnv, ...WORKERS_OFF, ...env }
  // Registered here, while the file is being collected: a hook added later (from inside a
  // beforeAll, where instances are usually started) would never run.
  afterAll(() => Promise.all([...runningInstances].map(stop => stop('SIGKILL'))))
  await setup({
    rootDir: ROOT,
    build: false,
    server: true,
    nuxtConfig: { nitro: { output: { dir: `${ROOT}/.output` } } },
    env: fileServerEnv,
    setupTimeout: 180_000,
    ...options,
  })
}

/** The env this file's first server was started with; another instance starts from the same. */
let fileServerEnv: Record<string, string> | undefined
/** Stops of the instances still running, so none outlives its file (it would hold memory and CPU). */
const runningInstances = new Set<(signal: 'SIGTERM' | 'SIGKILL') => Promise<void>>()
const runningChildren = new Set<ChildProcess>()
// The last guard if the test process ends without its hooks (a crash, a timeout): no orphans.
process.once('exit', () => { for (const child of runningChildren) child.kill('SIGKILL') })

function freeLoopbackPort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer().once('error', reject).listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number }
      probe.close(() => resolve(port))
    })
  })
}

export interface ServerInstance {
  /** Base address, no trailing slash: `${instance.url}/api/...`. */
  url: string
  /** Process id, as the instance names itself in rows it owns (e.g. an OPC UA connection's owner, host:pid:suffix). */
  pid: number
  /** Everything the instance printed, for a test that reads its start-up lines. */
  logs: () => string
  /** Ends the process: SIGTERM lets it close; SIGKILL is a crash (nothing runs after it). */
  stop: (signal?: 'SIGTERM' | 'SIGKILL') => Promise<void>
}

/**
 * One more instance of the same build on this file's database, as a second machine behind a load
 * balancer would run it (call after setupBuiltServer). The first server migrated and seeded, so
 * this one does not seed unless asked; sessions are sealed cookies, so a cookie from either
 * instance opens the other. Killed after the file's tests if the test did not stop it.
 */
export async function startServerInstance(env: Record<string, string> = {}): Promise<ServerInstance> {
  if (!fileServerEnv) throw new Error('startServerInstance: call setupBuiltServer first')
  const port = await freeLoopbackPort()
  const url = `http://127.0.0.1:${port}`
  let output = ''
  const child: ChildProcess = spawn('node', [`${ROOT}/.output/server/index.mjs`], {
    env: { ...process.env, PORT: String(port), HOST: '127.0.0.1', BRINKLINE_SEED_DEMO: '0', ...fileServerEnv, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  child.stdout!.on('data', (chunk: Buffer) => { output += chunk.toString() })
  child.stderr!.on('data', (chunk: Buffer) => { output += chunk.toString() })
  runningChildren.add(child)
  const exited = new Promise<void>(resolve => child.once('exit', () => {
    runningChildren.delete(child)
    runningInstances.delete(stop)
    resolve()
  }))
  const stop = async (signal: 'SIGTERM' | 'SIGKILL' = 'SIGTERM') => {
    if (child.exitCode === null && child.signalCode === null) child.kill(signal)
    await exited
  }
  runningInstances.add(stop)

  const deadline = Date.now() + 180_000
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server instance exited with ${child.exitCode}: ${output.slice(-2000)}`)
    const res = await fetch(`${url}/api/public/health`).catch(() => null)
    if (res?.status === 200) return { url, pid: child.pid!, logs: () => output, stop }
    await new Promise(resolve => setTimeout(resolve, 250))
  }
  await stop('SIGKILL')
  throw new Error(`server instance on ${url} was not healthy within 180 s: ${output.slice(-2000)}`)
}
