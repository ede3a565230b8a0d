import { getServerLogs } from '@nuxt/test-utils/e2e'
import { describe, expect, it } from 'vitest'
import { setupBuiltServer } from '../support/server'

// A test server that does not ask for the OPC UA collector or the replay worker starts neither
// (server/utils/backgroundWorkers.ts). Before, both checked NODE_ENV=test, which a built server
// never sees: @nuxt/test-utils starts it with NODE_ENV=production and the build had replaced the
// check with `false`, so every e2e server ran both.
await setupBuiltServer()

const logged = (line: string) => getServerLogs().some(l => String(l).includes(line))

describe('background workers in a test server', () => {
  it('are off unless the test asks, and the server says so at start-up', async () => {
    await expect.poll(() => logged('[opcua] collector off'), { timeout: 30_000 }).toBe(true)
    await expect.poll(() => logged('[replay] worker off'), { timeout: 30_000 }).toBe(true)
    expect(logged('[opcua] collector started')).toBe(false)
    expect(logged('[replay] worker started')).toBe(false)
  })
})
