import { createServer } from 'node:net'

/** A loopback port free right now, for a plant OPC UA server started by a test. */
export async function freeLoopbackPort(): Promise<number> {
  const server = createServer().listen(0, '127.0.0.1')
  await new Promise(resolve => server.once('listening', resolve))
  const { port } = server.address() as { port: number }
  await new Promise(resolve => server.close(resolve))
  return port
}

export { eventually } from './eventually'
