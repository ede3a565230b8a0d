import { randomBytes } from 'node:crypto'
import { fileURLToPath } from 'node:url'
import { setup } from '@nuxt/test-utils/e2e'
import postgres from 'postgres'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))

/**
 * A database of this test file's own on the suite's PostgreSQL, so files never see each other's
 * rows (the server migrates and seeds it at start). The test process's NUXT_DATABASE_URL points
 * at it too, for tests/support/db.ts.
 */
async function createFileDatabase(): Promise<string> {
  const suiteUrl = process.env.BRINKLINE_SUITE_DATABASE_URL ?? process.env.NUXT_DATABASE_URL
  if (!suiteUrl) throw new Error('NUXT_DATABASE_URL is not set: run the suite through `npm test`')
  process.env.BRINKLINE_SUITE_DATABASE_URL = suiteUrl
  const name = `brinkline_test_${randomBytes(6).toString('hex')}`
  const admin = postgres(suiteUrl, { max: 1, onnotice: () => {} })
  await admin.unsafe(`create database ${name}`)
  await admin.end()
  const url = new URL(suiteUrl)
  url.pathname = `/${name}`
  process.env.NUXT_DATABASE_URL = url.toString()
  process.env.DATABASE_URL = url.toString()
  return url.toString()
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
  const databaseUrl = await createFileDatabase()
  await setup({
    rootDir: ROOT,
    build: false,
    server: true,
    nuxtConfig: { nitro: { output: { dir: `${ROOT}/.output` } } },
    env: { NUXT_DATABASE_URL: databaseUrl, ...WORKERS_OFF, ...env },
    setupTimeout: 180_000,
    ...options,
  })
}
