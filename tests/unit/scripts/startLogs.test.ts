import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, describe, expect, it } from 'vitest'

const ROOT = fileURLToPath(new URL('../../..', import.meta.url))
const dir = mkdtempSync(join(tmpdir(), 'bl-logs-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

const openLog = (log: string, env: Record<string, string> = {}) => {
  const r = spawnSync('bash', ['-c', `source scripts/lib.sh && open_run_log "$1"`, 'x', log], { cwd: ROOT, env: { ...process.env, ...env }, encoding: 'utf8' })
  expect(r.status, r.stderr).toBe(0)
}

// Issue 12 item 10: a new `npm start` must not wipe the previous run's logs.
describe('npm start logs', () => {
  it('appends each run after a banner instead of truncating the last one', () => {
    const log = join(dir, 'server.log')
    openLog(log)
    writeFileSync(log, 'first run line\n', { flag: 'a' })
    openLog(log)
    const text = readFileSync(log, 'utf8')
    expect(text).toContain('first run line')
    expect(text.match(/===== .* npm start/g)).toHaveLength(2)
  })

  it('moves a log past its size limit to .1 (and .1 to .2), keeping the newest runs', () => {
    const log = join(dir, 'sim.log')
    writeFileSync(log, 'x'.repeat(200))
    writeFileSync(`${log}.1`, 'older')
    openLog(log, { BRINKLINE_LOG_MAX_BYTES: '100' })
    expect(readFileSync(`${log}.1`, 'utf8')).toBe('x'.repeat(200))
    expect(readFileSync(`${log}.2`, 'utf8')).toBe('older')
    expect(readFileSync(log, 'utf8')).toMatch(/^===== /)
    expect(existsSync(`${log}.3`)).toBe(false)
  })

  it('starts the simulators without the gateway key on their command line (ps shows arguments to every user)', () => {
    const start = readFileSync(join(ROOT, 'scripts/start.sh'), 'utf8')
    const simLine = start.split('\n').find(l => l.includes('simulators/run.ts'))!
    expect(simLine).not.toMatch(/--key|SIM_KEY/)
    expect(start).toMatch(/set -a; source "\$CREDS"; set \+a/)
  })
})
