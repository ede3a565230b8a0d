import { describe, expect, it } from 'vitest'
import { opcuaUnitsOf } from '../../../../simulators/lib/opcuaServedUnits'
import { parseRunOptions } from '../../../../simulators/lib/runOptions'

// Which demo units the simulators serve over OPC UA: each unit by one path only (docs/opcua.md §O5).
describe('demo units over OPC UA', () => {
  it('serves the steady feed tank over OPC UA only when a port is given', () => {
    expect(opcuaUnitsOf(['cstr', 'digester', 'grid', 'steady'], 4840)).toEqual(['steady'])
    expect(opcuaUnitsOf(['cstr', 'digester', 'grid', 'steady'], null)).toEqual([])
    expect(opcuaUnitsOf(['cstr'], 4840)).toEqual([])
  })

  it('takes --opcua-port as a TCP port number, 1–65535 (RFC 793: ports are 16 bits [from memory])', () => {
    const env = { BRINKLINE_SIM_KEY: 'bk_x' }
    expect(parseRunOptions(['--opcua-port', '4840'], env).opcuaPort).toBe(4840)
    expect(parseRunOptions([], env).opcuaPort).toBeNull()
    for (const bad of ['0', '65536', 'x', '48.5']) expect(() => parseRunOptions(['--opcua-port', bad], env)).toThrow(/--opcua-port/)
  })
})
