import { StatusCodes } from 'node-opcua'
import { describe, expect, it } from 'vitest'
import { qualityOfStatusCode, sampleTimeOf } from '../../../../shared/opcua/statusQuality'

// Check values are node-opcua's own StatusCodes table (generated from the OPC Foundation's
// StatusCode.csv), the reference library, not numbers typed here.
describe('OPC UA status code → sample quality (IEC 62541-4 §7.39 severity bits)', () => {
  it('Good codes are good', () => {
    for (const c of [StatusCodes.Good, StatusCodes.GoodClamped, StatusCodes.GoodOverload]) expect(qualityOfStatusCode(c.value)).toBe('good')
  })
  it('Uncertain codes are uncertain', () => {
    const codes = [
      StatusCodes.UncertainLastUsableValue, StatusCodes.UncertainSensorNotAccurate, StatusCodes.UncertainEngineeringUnitsExceeded
    ]
    for (const c of codes) expect(qualityOfStatusCode(c.value)).toBe('uncertain')
  })
  it('Bad codes are bad', () => {
    const codes = [
      StatusCodes.BadSensorFailure, StatusCodes.BadCommunicationError, StatusCodes.BadOutOfService, StatusCodes.BadNoCommunication
    ]
    for (const c of codes) expect(qualityOfStatusCode(c.value)).toBe('bad')
  })
})

describe('sample time: source timestamp, else server timestamp', () => {
  const source = new Date('2026-05-01T12:00:00Z')
  const server = new Date('2026-05-01T12:00:01Z')
  it('prefers the source timestamp', () => expect(sampleTimeOf(source, server)).toEqual({ timeMs: source.getTime(), basis: 'source' }))
  it('falls back to the server timestamp when the source gave none', () => {
    expect(sampleTimeOf(null, server)).toEqual({ timeMs: server.getTime(), basis: 'server' })
    // node-opcua reports a missing DateTime as the OPC UA minimum (1601-01-01), a negative epoch.
    expect(sampleTimeOf(new Date(Date.UTC(1601, 0, 1)), server)?.basis).toBe('server')
  })
  it('no timestamp at all gives no time', () => expect(sampleTimeOf(undefined, null)).toBeNull())
})
