import { execFileSync } from 'node:child_process'
import { ROOT } from './server'

/** Stops or starts the suite's own PostgreSQL (scripts/test.sh exported its data dir and port). */
export function postgres(action: 'stop' | 'start') {
  execFileSync('bash', [`${ROOT}/scripts/pg.sh`, action], { stdio: 'pipe', env: process.env })
}
