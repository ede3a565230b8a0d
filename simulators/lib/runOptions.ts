// Command-line and environment options of simulators/run.ts.
import { parseArgs } from 'node:util'
import { CATALOGUE, type UnitCode } from '../../shared/demo/catalogue'

export interface RunOptions {
  units: UnitCode[]
  url: string
  key: string
  speed: number
  seed: number
  backfillHours: number
}

export const USAGE = 'usage: npx tsx simulators/run.ts --unit cstr|digester|grid|steady|all --url http://127.0.0.1:3000 '
  + '--key <gateway key> [--speed N] [--seed S] [--backfill-hours H]\n'
  + '  --speed: multiple of the demo pace (1: each drifting unit reaches its fold in 35–45 min of wall time)\n'
  + '  --backfill-hours: first post this much history, as fast as the server takes it\n'
  + '  env: BRINKLINE_URL, BRINKLINE_SIM_KEY, SIM_SPEED'

function positiveNumber(name: string, raw: string): number {
  const value = Number(raw)
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be a positive number, got "${raw}"`)
  return value
}

export function parseRunOptions(argv: string[], env: NodeJS.ProcessEnv): RunOptions {
  const { values } = parseArgs({
    args: argv,
    options: {
      'unit': { type: 'string', default: 'all' },
      'url': { type: 'string' },
      'key': { type: 'string' },
      'speed': { type: 'string' },
      'seed': { type: 'string', default: '1' },
      'backfill-hours': { type: 'string', default: '0' },
    },
    strict: true,
  })
  const codes = CATALOGUE.map(u => u.code)
  const unit = values.unit!
  if (unit !== 'all' && !codes.includes(unit as UnitCode)) throw new RangeError(`unknown unit "${unit}"; one of ${codes.join(', ')}, all`)
  const key = values.key ?? env.BRINKLINE_SIM_KEY
  if (!key) throw new RangeError('a gateway key is needed: --key or BRINKLINE_SIM_KEY')
  const seed = Number(values.seed)
  if (!Number.isInteger(seed)) throw new RangeError(`--seed must be an integer, got "${values.seed}"`)
  const backfillHours = Number(values['backfill-hours'])
  if (!Number.isFinite(backfillHours) || backfillHours < 0) throw new RangeError(`--backfill-hours must be ≥ 0, got "${values['backfill-hours']}"`)
  return {
    units: unit === 'all' ? codes : [unit as UnitCode],
    url: values.url ?? env.BRINKLINE_URL ?? 'http://127.0.0.1:3000',
    key,
    speed: positiveNumber('--speed', values.speed ?? env.SIM_SPEED ?? '1'),
    seed,
    backfillHours,
  }
}
