import type { QualityName } from '../utils/sampleQuality'

/**
 * Sample quality from an OPC UA StatusCode. IEC 62541-4 §7.39 puts the severity in the top two
 * bits of the 32-bit code: 00 Good, 01 Uncertain, 10 Bad (11 is reserved and read as Bad).
 * Uncertain and Bad become sample qualities that the pipeline never alarms on.
 */
export function qualityOfStatusCode(code: number): QualityName {
  const severity = (code >>> 30) & 0b11
  if (severity === 0) return 'good'
  if (severity === 1) return 'uncertain'
  return 'bad'
}

/** Which clock a stored time came from: the device's (source) or the OPC UA server's. */
export type TimeBasis = 'source' | 'server'

/**
 * The time a value is stored under: its source timestamp where the server gives one, the server
 * timestamp otherwise (IEC 62541-4 §7.7: the source timestamp is the one the data source
 * applied, the server timestamp the one the server applied on receipt).
 */
export function sampleTimeOf(sourceTimestamp: Date | null | undefined, serverTimestamp: Date | null | undefined):
{ timeMs: number, basis: TimeBasis } | null {
  const usable = (d: Date | null | undefined) => d instanceof Date && Number.isFinite(d.getTime()) && d.getTime() > 0
  if (usable(sourceTimestamp)) return { timeMs: sourceTimestamp!.getTime(), basis: 'source' }
  if (usable(serverTimestamp)) return { timeMs: serverTimestamp!.getTime(), basis: 'server' }
  return null
}
