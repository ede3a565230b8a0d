// The background workers every server instance runs (the OPC UA collector, the replay worker),
// each switched off in one instance by its variable set to `0`: an instance that should only
// answer requests, or a test server that does not need the worker.
//
// Why not NODE_ENV: the build replaces the literal `process.env.NODE_ENV` with "production", and
// @nuxt/test-utils starts a built server with NODE_ENV=production anyway, so a server cannot tell
// it is under test. tests/support/server.ts sets these variables to `0` unless a test asks for a worker.
export type BackgroundWorkerSwitch = 'BRINKLINE_OPCUA_COLLECTOR' | 'BRINKLINE_REPLAY_WORKER'

export function backgroundWorkerOn(name: BackgroundWorkerSwitch, env: NodeJS.ProcessEnv = process.env): boolean {
  return env[name] !== '0'
}
