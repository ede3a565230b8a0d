// A throwaway PostgreSQL and built server for benchmarks, the same way scripts/test.sh makes
// them: own data dir, free port, stopped afterwards.
import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import postgres from 'postgres'

export const ROOT = fileURLToPath(new URL('../../../', import.meta.url))
export const BENCH_SIM_KEY = 'bk_bench_simulator_key_0000000000000000000000'
export const BENCH_PASSWORD = 'bench-demo-password'

export function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = createServer().listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as { port: number }
      srv.close(() => resolve(port))
    })
  })
}

export interface BenchStack {
  url: string
  databaseUrl: string
  sql: postgres.Sql
  /** One more built server on the same database (not seeding: the first one did), for A/B runs. */
  addServer: (extraEnv: Record<string, string>) => Promise<string>
  stop: () => Promise<void>
}

/** PostgreSQL + the built server (built first if sources changed). */
export async function startStack(extraEnv: Record<string, string> = {}): Promise<BenchStack> {
  execFileSync('bash', ['-c', 'source scripts/lib.sh && ensure_build'], { cwd: ROOT, stdio: 'inherit' })
  const pgEnv = {
    ...process.env,
    BRINKLINE_PGDATA: mkdtempSync(join(tmpdir(), 'brinkline-bench-pg-')),
    BRINKLINE_PGPORT: String(await freePort()),
    BRINKLINE_PGFSYNC: 'off',
  }
  const pg = (action: string) => execFileSync('bash', [`${ROOT}scripts/pg.sh`, action], { env: pgEnv, encoding: 'utf8' }).trim()
  pg('start')
  const databaseUrl = pg('url')
  const servers: ChildProcess[] = []
  const spawnServer = async (env: Record<string, string>) => {
    const port = await freePort()
    servers.push(spawn('node', [`${ROOT}.output/server/index.mjs`], {
      env: {
        ...process.env, PORT: String(port), HOST: '127.0.0.1', NUXT_DATABASE_URL: databaseUrl,
        NUXT_SESSION_PASSWORD: 'bench-session-password-at-least-32-characters', BRINKLINE_SEED_DEMO: '1',
        BRINKLINE_DEMO_PASSWORD: BENCH_PASSWORD, BRINKLINE_SIM_KEY: BENCH_SIM_KEY, ...env,
      },
      stdio: 'ignore',
    }))
    return `http://127.0.0.1:${port}`
  }
  const url = await spawnServer(extraEnv)
  await waitForSeed(url)
  const sql = postgres(databaseUrl, { max: 4, onnotice: () => {} })
  return {
    url, databaseUrl, sql,
    async addServer(env) {
      const other = await spawnServer({ ...extraEnv, BRINKLINE_SEED_DEMO: '0', ...env })
      await waitForHealth(other)
      return other
    },
    async stop() {
      await sql.end()
      for (const server of servers) server.kill()
      pg('stop')
      rmSync(pgEnv.BRINKLINE_PGDATA, { recursive: true, force: true })
    },
  }
}

// The seed runs just after start-up; the simulator gateway existing means it has finished.
async function waitForSeed(url: string) {
  for (let i = 0; i < 240; i++) {
    const res = await fetch(`${url}/api/ingest`, {
      method: 'POST', headers: { 'authorization': `Bearer ${BENCH_SIM_KEY}`, 'content-type': 'application/json' },
      body: JSON.stringify({ samples: [{ tag: 'none', time: 946_684_800_000, value: 0 }] }),
    }).catch(() => null)
    if (res?.status === 200) return
    await new Promise(r => setTimeout(r, 250))
  }
  throw new Error('server did not come up with the demo gateway')
}

async function waitForHealth(url: string) {
  for (let i = 0; i < 240; i++) {
    if ((await fetch(`${url}/api/public/health`).catch(() => null))?.status === 200) return
    await new Promise(r => setTimeout(r, 250))
  }
  throw new Error(`server ${url} did not come up`)
}

/** Formats a number of rows per second for a table. */
export const perSecond = (rows: number, ms: number) => Math.round(rows / (ms / 1000))
