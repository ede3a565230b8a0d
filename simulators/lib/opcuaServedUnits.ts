// The demo units served over OPC UA (shared/demo/opcuaDemo.ts): their samples go to the plant
// server, where Brinkline's collector subscribes to them, and never to the HTTP ingest client,
// so no tag gets its samples by both paths.
import { catalogueUnit, type UnitCode } from '../../shared/demo/catalogue'
import { DEMO_OPCUA_UNITS } from '../../shared/demo/opcuaDemo'
import type { IngestSample } from './ingestClient'
import { OpcuaPlantServer } from './opcuaPlantServer'

// About 28 hours of the demo's 5-second tags: enough history for a Brinkline restart to fill its gap from.
const HISTORY_VALUES = 20_000

/** Which of the units to run go over OPC UA (none without a port). */
export function opcuaUnitsOf(units: UnitCode[], port: number | null): UnitCode[] {
  return port === null ? [] : units.filter(code => DEMO_OPCUA_UNITS.includes(code))
}

export class OpcuaServedUnits {
  private readonly server: OpcuaPlantServer
  published = 0

  constructor(units: UnitCode[], port: number, pkiDir: string) {
    this.server = new OpcuaPlantServer({
      port, pkiDir, historyValues: HISTORY_VALUES,
      units: units.map((code) => {
        const unit = catalogueUnit(code)
        return { name: unit.name, tags: unit.tags.map(t => ({ code: t.code, description: t.description, engineeringUnit: t.engineeringUnit,
          rangeLow: t.rangeLow, rangeHigh: t.rangeHigh })) }
      }),
    })
  }

  get endpointUrl() { return this.server.endpointUrl }

  start() { return this.server.start() }
  stop() { return this.server.stop() }

  publish(samples: IngestSample[]) {
    for (const s of samples) this.server.publish(s.tag, s.value, Date.parse(s.time), s.quality)
    this.published += samples.length
  }

  /** Requests that could change the plant, by type: the collector must never send one. */
  plantChangingRequests() { return this.server.plantChangingRequests() }
}
