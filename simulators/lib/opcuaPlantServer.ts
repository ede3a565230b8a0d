// A plant's OPC UA server, as a control system would publish its measurements (IEC 62541): one
// folder per unit, one AnalogItem per tag (engineering units and range as properties), each
// value with its source timestamp and status, and the recent past kept for HistoryRead. The demo
// simulators and the tests serve their tags through it on loopback.
//
// It counts every request that could change the plant (Write, Call, node management,
// HistoryUpdate), so a test can prove a client never sent one.
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import {
  DataType, makeEUInformation, MessageSecurityMode, OPCUACertificateManager, OPCUAServer, SecurityPolicy,
  StatusCodes, type StatusCode, type UAObject, type UAVariable,
} from 'node-opcua'
import { PLANT_SERVER_PATH, plantEndpointUrl } from '../../shared/demo/opcuaDemo'

export interface PlantServerTag {
  code: string
  description: string
  engineeringUnit: string
  rangeLow: number
  rangeHigh: number
}

export interface PlantServerUnit {
  name: string
  tags: PlantServerTag[]
}

export interface PlantServerOptions {
  port: number
  units: PlantServerUnit[]
  /** Where the server keeps its certificate (created on first start). */
  pkiDir: string
  /** Values kept per tag for HistoryRead; 0 offers no history. */
  historyValues?: number
  /** When given, only these may sign in (and anonymous sessions are refused). */
  users?: { username: string, password: string }[]
}

export type PlantQuality = 'good' | 'uncertain' | 'bad'

// Services that change a server's state or the plant behind it (IEC 62541-4 §5.8 node
// management, §5.10.4 Write, §5.10.5 HistoryUpdate, §5.11 Call).
const PLANT_CHANGING_REQUESTS = new Set(['WriteRequest', 'CallRequest', 'HistoryUpdateRequest', 'AddNodesRequest',
  'AddReferencesRequest', 'DeleteNodesRequest', 'DeleteReferencesRequest'])

const STATUS_OF: Record<PlantQuality, StatusCode> = {
  good: StatusCodes.Good, uncertain: StatusCodes.UncertainLastUsableValue, bad: StatusCodes.BadSensorFailure,
}

export { plantNodeId } from '../../shared/demo/opcuaDemo'

interface Reading { value: number, timeMs: number, quality: PlantQuality }

export class OpcuaPlantServer {
  /** Every request by type name, since the first start. */
  readonly requests = new Map<string, number>()
  private server: OPCUAServer | undefined
  private variables = new Map<string, UAVariable>()
  private unitFolders = new Map<string, UAObject>()
  // The plant's own record, outside the OPC UA server, so a server restart keeps its history as a
  // plant server with a historian would.
  private journal = new Map<string, Reading[]>()

  constructor(private readonly options: PlantServerOptions) {}

  get endpointUrl() { return plantEndpointUrl(this.options.port) }

  /** How many requests that could change the plant arrived, by type. */
  plantChangingRequests(): Record<string, number> {
    return Object.fromEntries([...this.requests].filter(([name]) => PLANT_CHANGING_REQUESTS.has(name)))
  }

  /** Sessions the server holds right now. */
  get sessionCount(): number {
    return this.server?.currentSessionCount ?? 0
  }

  async start(): Promise<void> {
    mkdirSync(this.options.pkiDir, { recursive: true })
    const serverCertificateManager = new OPCUACertificateManager({ rootFolder: join(this.options.pkiDir, 'server'), automaticallyAcceptUnknownCertificate: true })
    const userCertificateManager = new OPCUACertificateManager({ rootFolder: join(this.options.pkiDir, 'users'), automaticallyAcceptUnknownCertificate: true })
    const users = this.options.users
    const server = new OPCUAServer({
      port: this.options.port,
      hostname: '127.0.0.1',
      alternateHostname: ['127.0.0.1'],
      resourcePath: PLANT_SERVER_PATH,
      serverCertificateManager,
      userCertificateManager,
      disableDiscovery: true,
      allowAnonymous: !users,
      securityModes: [MessageSecurityMode.None, MessageSecurityMode.Sign, MessageSecurityMode.SignAndEncrypt],
      securityPolicies: [SecurityPolicy.None, SecurityPolicy.Basic256Sha256],
      userManager: users
        ? { isValidUser: (name: string, password: string) => users.some(u => u.username === name && u.password === password) }
        : undefined,
      buildInfo: { productName: 'Fenwick Works demo plant server', manufacturerName: 'Harrowgate Process Co. (invented)' },
    })
    server.on('request', (request: { schema: { name: string } }) => {
      this.requests.set(request.schema.name, (this.requests.get(request.schema.name) ?? 0) + 1)
    })
    await server.initialize()
    this.buildAddressSpace(server)
    await server.start()
    this.server = server
  }

  async stop(): Promise<void> {
    const server = this.server
    this.server = undefined
    this.variables.clear()
    await server?.shutdown(0)
  }

  /** Publishes one reading with its source timestamp (and keeps it for HistoryRead). */
  publish(code: string, value: number, timeMs: number, quality: PlantQuality = 'good'): void {
    const reading = { value, timeMs, quality }
    const journal = this.journal.get(code)
    if (!journal) throw new RangeError(`no tag ${code} on this server`)
    journal.push(reading)
    const limit = this.options.historyValues ?? 0
    if (journal.length > Math.max(1, limit)) journal.splice(0, journal.length - Math.max(1, limit))
    this.variables.get(code)?.setValueFromSource({ dataType: DataType.Double, value }, STATUS_OF[quality], new Date(timeMs))
  }

  /** Adds a tag to a unit, as a plant engineer would add a point; served at once when running, and after every restart. */
  addTag(unitName: string, tag: PlantServerTag): void {
    const unit = this.options.units.find(u => u.name === unitName)
    if (!unit) throw new RangeError(`no unit ${unitName} on this server`)
    unit.tags.push(tag)
    const folder = this.unitFolders.get(unitName)
    if (this.server && folder) this.addVariable(this.server, folder, tag)
  }

  private buildAddressSpace(server: OPCUAServer): void {
    const addressSpace = server.engine.addressSpace!
    const namespace = addressSpace.getOwnNamespace()
    const plant = namespace.addFolder(addressSpace.rootFolder.objects, { browseName: 'Plant' })
    this.unitFolders.clear()
    for (const unit of this.options.units) {
      const folder = namespace.addFolder(plant, { browseName: unit.name })
      this.unitFolders.set(unit.name, folder)
      for (const tag of unit.tags) this.addVariable(server, folder, tag)
    }
  }

  private addVariable(server: OPCUAServer, folder: UAObject, tag: PlantServerTag): void {
    const addressSpace = server.engine.addressSpace!
    const variable = addressSpace.getOwnNamespace().addAnalogDataItem({
      componentOf: folder,
      browseName: tag.code,
      nodeId: `s=${tag.code}`,
      displayName: tag.code,
      description: tag.description,
      dataType: 'Double',
      engineeringUnitsRange: { low: tag.rangeLow, high: tag.rangeHigh },
      engineeringUnits: makeEUInformation(tag.engineeringUnit, tag.engineeringUnit, tag.engineeringUnit),
      minimumSamplingInterval: 0,
    })
    const history = this.options.historyValues ?? 0
    if (history > 0) addressSpace.installHistoricalDataNode(variable, { maxOnlineValue: history })
    if (!this.journal.has(tag.code)) this.journal.set(tag.code, [])
    // Replay what the plant recorded before this start, oldest first, so history and the
    // current value survive a restart.
    for (const r of this.journal.get(tag.code)!)
      variable.setValueFromSource({ dataType: DataType.Double, value: r.value }, STATUS_OF[r.quality], new Date(r.timeMs))
    this.variables.set(tag.code, variable)
  }
}
