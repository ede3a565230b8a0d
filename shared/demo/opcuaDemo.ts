import type { UnitCode } from './catalogue'

// Which demo units reach Brinkline over OPC UA, and how the demo's plant server names them: one
// place for the simulators (which serve these units and post the others over HTTP) and the seed
// (which sets up the connection to them). A tag comes by one path only, never both.

/** Served from the simulators' OPC UA server on loopback; every other unit is posted to /api/ingest. */
export const DEMO_OPCUA_UNITS: readonly UnitCode[] = ['steady']

/** Name of the connection the seed makes to the simulators' OPC UA server. */
export const DEMO_OPCUA_CONNECTION = 'Demo plant OPC UA server'

/** Path part of the plant server's endpoint: opc.tcp://127.0.0.1:<port>/brinkline-plant. */
export const PLANT_SERVER_PATH = '/brinkline-plant'

/** The node id a tag is served under by the plant server: its own namespace (1), string id = tag code. */
export const plantNodeId = (code: string) => `ns=1;s=${code}`

export const plantEndpointUrl = (port: number) => `opc.tcp://127.0.0.1:${port}${PLANT_SERVER_PATH}`
