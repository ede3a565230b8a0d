import { spawnSync } from 'node:child_process'
import { chmodSync, chownSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { createServer, type Server } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, describe, expect, it } from 'vitest'

const PG_SH = fileURLToPath(new URL('../../../scripts/pg.sh', import.meta.url))
const isRoot = process.getuid?.() === 0
const cleanup: string[] = []
afterAll(() => cleanup.forEach(dir => rmSync(dir, { recursive: true, force: true })))

function pgSh(env: Record<string, string>, asUser?: string) {
  const cmd = asUser ? ['runuser', '-u', asUser, '--', 'bash', PG_SH, 'start'] : ['bash', PG_SH, 'start']
  const result = spawnSync(cmd[0]!, cmd.slice(1), { env: { ...process.env, ...env }, encoding: 'utf8', cwd: tmpdir() })
  return { status: result.status, stderr: result.stderr.trim() }
}

function tempDir(prefix: string) {
  const dir = mkdtempSync(join(tmpdir(), prefix))
  cleanup.push(dir)
  return dir
}

// Each failure of the PostgreSQL lifecycle script must be one clear line, not a stack of noise.
describe('scripts/pg.sh start refuses clearly', () => {
  it('when the port is already taken', async () => {
    const server: Server = await new Promise(resolve => { const s = createServer().listen(0, '127.0.0.1', () => resolve(s)) })
    const port = (server.address() as { port: number }).port
    const dir = tempDir('bl-pg-port-')
    chmodSync(dir, 0o755)
    const { status, stderr } = pgSh({ BRINKLINE_PGDATA: join(dir, 'data'), BRINKLINE_PGPORT: String(port) })
    server.close()
    expect(status).not.toBe(0)
    expect(stderr.split('\n').at(-1)).toMatch(new RegExp(`port ${port} .*already in use`))
  }, 60_000)

  it.runIf(isRoot)('when the data directory belongs to someone else', () => {
    const dir = tempDir('bl-pg-owner-')
    writeFileSync(join(dir, 'PG_VERSION'), '15\n')
    chownSync(dir, 65534, 65534)
    const { status, stderr } = pgSh({ BRINKLINE_PGDATA: dir, BRINKLINE_PGPORT: '1' })
    expect(status).not.toBe(0)
    expect(stderr).toMatch(/is owned by 'nobody', expected 'postgres'/)
    expect(stderr.split('\n')).toHaveLength(1)
  })

  it.runIf(isRoot)('when PostgreSQL is missing and the user cannot install it', () => {
    const dir = tempDir('bl-pg-missing-')
    chownSync(dir, 65534, 65534)
    const { status, stderr } = pgSh({ BRINKLINE_PGDATA: join(dir, 'data'), PGBIN: '/nonexistent/bin', HOME: dir }, 'nobody')
    expect(status).not.toBe(0)
    expect(stderr).toBe("brinkline-pg: PostgreSQL 15 is missing: install it with 'sudo apt-get install postgresql-15' (or set PGBIN)")
  })
})
