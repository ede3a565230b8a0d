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
  /** Loopback port of the OPC UA server that serves the demo's OPC UA units (shared/demo/opcuaDemo.ts); none: every unit over HTTP. */
  opcuaPort: number | null
  /** Where that server keeps its certificate. */
  opcuaPkiDir: string
}

export const USAGE = 'usage: npx tsx simulators/run.ts --unit cstr|digester|grid|steady|all --url http://127.0.0.1:3000 '
  + '--key <gateway key> [--speed N] [--seed S] [--backfill-hours H] [--opcua-port P]\n'
  + '  --speed: multiple of the demo pace (1: each drifting unit reaches its fold in 35–45 min of wall time)\n'
  + '  --backfill-hours: first post this much history, as fast as the server takes it\n'
  + '  --opcua-port: serve the OPC UA units (T-400) from an OPC UA server on 127.0.0.1:P instead of posting them\n'
  + '  env: BRINKLINE_URL, BRINKLINE_SIM_KEY, SIM_SPEED, SIM_OPCUA_PKI_DIR'

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
      'opcua-port': { type: 'string' },
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
  const opcuaPort = values['opcua-port'] === undefined ? null : Number(values['opcua-port'])
  if (opcuaPort !== null && !(Number.isInteger(opcuaPort) && opcuaPort > 0 && opcuaPort < 65536))
    throw new RangeError(`--opcua-port must be a port number 1–65535, got "${values['opcua-port']}"`)
  return {
    units: unit === 'all' ? codes : [unit as UnitCode],
    url: values.url ?? env.BRINKLINE_URL ?? 'http://127.0.0.1:3000',
    key,
    speed: positiveNumber('--speed', values.speed ?? env.SIM_SPEED ?? '1'),
    seed,
    backfillHours,
    opcuaPort,
    opcuaPkiDir: env.SIM_OPCUA_PKI_DIR || '.data/opcua-plant-pki',
  }
}
