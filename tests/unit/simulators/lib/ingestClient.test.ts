import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { afterEach, describe, expect, it } from 'vitest'
import { IngestClient, type IngestSample } from '../../../../simulators/lib/ingestClient'
import { backoffDelay, parseRetryAfter } from '../../../../shared/utils/retryDelay'

type Reply = { status: number; headers?: Record<string, string>; body?: unknown }

/** Fake ingest endpoint on loopback: records every sample in requests it answered 200. */
function fakeIngest(decide: (requestNumber: number, samples: IngestSample[]) => Reply) {
  const stored = new Map<string, number>()
  const batchSizes: number[] = []
  const authorisations: string[] = []
  let requests = 0
  const server = createServer((req, res) => {
    let body = ''
    req.on('data', (chunk) => { body += chunk })
    req.on('end', () => {
      requests++
      authorisations.push(req.headers.authorization ?? '')
      const samples = (JSON.parse(body) as { samples: IngestSample[] }).samples
      expect(req.url).toBe('/api/ingest')
      const reply = decide(requests, samples)
      if (reply.status === 200) {
        batchSizes.push(samples.length)
        let duplicates = 0
        for (const s of samples) {
          const key = `${s.tag}|${s.time}`
          if (stored.has(key)) duplicates++
          stored.set(key, (stored.get(key) ?? 0) + 1)
        }
        reply.body ??= { accepted: samples.length - duplicates, duplicates, rejected: [] }
      }
      res.writeHead(reply.status, { 'Content-Type': 'application/json', ...reply.headers })
      res.end(JSON.stringify(reply.body ?? { message: 'no' }))
    })
  })
  return { server, stored, batchSizes, authorisations, requestCount: () => requests }
}

function listen(server: Server, port = 0): Promise<string> {
  return new Promise(resolve => server.listen(port, '127.0.0.1', () =>
    resolve(`http://127.0.0.1:${(server.address() as AddressInfo).port}`)))
}

function makeSamples(count: number, tag = 'TI-101'): IngestSample[] {
  return Array.from({ length: count }, (_, i) => ({ tag, time: new Date(Date.UTC(2025, 0, 1) + i * 1000).toISOString(), value: 350 + i / 1000, quality: 'good' }))
}

const servers: Server[] = []
afterEach(async () => {
  await Promise.all(servers.splice(0).map(s => new Promise(resolve => { s.closeAllConnections(); s.close(resolve) })))
})

const fast = { initialMs: 20, maxMs: 200 }
const quiet = () => {}

describe('IngestClient', () => {
  it('after a 503 with Retry-After, delivers every buffered sample exactly once', async () => {
    const fake = fakeIngest(n => n === 1 ? { status: 503, headers: { 'Retry-After': '1' } } : { status: 200 })
    servers.push(fake.server)
    const baseUrl = await listen(fake.server)
    const client = new IngestClient({ baseUrl, key: 'sim-key', backoff: fast, log: quiet })
    const samples = [...makeSamples(7_000), ...makeSamples(3_000, 'AI-102')]
    const started = Date.now()
    client.enqueue(samples)
    await client.idle()
    // Retry-After: 1 overrides the 20 ms backoff (RFC 9110 §10.2.3).
    expect(Date.now() - started).toBeGreaterThanOrEqual(950)
    expect(fake.stored.size).toBe(samples.length)
    for (const s of samples) expect(fake.stored.get(`${s.tag}|${s.time}`)).toBe(1)
    expect(Math.max(...fake.batchSizes)).toBeLessThanOrEqual(5_000)
    expect(fake.authorisations.every(a => a === 'Bearer sim-key')).toBe(true)
    expect(client.stats).toMatchObject({ accepted: 10_000, duplicates: 0, dropped: 0, buffered: 0, failedAttempts: 1 })
  })

  it('keeps everything through a refused connection until the server comes up', async () => {
    const probe = createServer()
    const baseUrl = await listen(probe)
    const port = Number(new URL(baseUrl).port)
    await new Promise(resolve => probe.close(resolve))
    const client = new IngestClient({ baseUrl, key: 'k', backoff: fast, log: quiet })
    const samples = makeSamples(1_234)
    client.enqueue(samples)
    await new Promise(resolve => setTimeout(resolve, 150))
    expect(client.stats.failedAttempts).toBeGreaterThan(0)
    expect(client.stats.lastError).toMatch(/network error/)
    expect(client.stats.buffered).toBe(1_234)
    const fake = fakeIngest(() => ({ status: 200 }))
    servers.push(fake.server)
    await listen(fake.server, port)
    await client.idle()
    expect(fake.stored.size).toBe(1_234)
    expect([...fake.stored.values()].every(count => count === 1)).toBe(true)
  })

  it('splits a batch the server finds too large (413) and loses none of it', async () => {
    const fake = fakeIngest((_, samples) => samples.length > 1_000 ? { status: 413 } : { status: 200 })
    servers.push(fake.server)
    const client = new IngestClient({ baseUrl: await listen(fake.server), key: 'k', backoff: fast, log: quiet })
    client.enqueue(makeSamples(4_500))
    await client.idle()
    expect(fake.stored.size).toBe(4_500)
    expect(Math.max(...fake.batchSizes)).toBeLessThanOrEqual(1_000)
  })

  it('counts what the server rejects and does not resend it', async () => {
    const fake = fakeIngest((_, samples) => ({
      status: 200, body: { accepted: samples.length - 1, duplicates: 0, rejected: [{ index: 0, field: 'value', reason: 'not finite' }] },
    }))
    servers.push(fake.server)
    const client = new IngestClient({ baseUrl: await listen(fake.server), key: 'k', backoff: fast, log: quiet })
    client.enqueue(makeSamples(10))
    await client.idle()
    expect(fake.requestCount()).toBe(1)
    expect(client.stats).toMatchObject({ accepted: 9, rejected: 1, buffered: 0 })
  })

  it('holds its samples on a bad key (401) and reports it', async () => {
    const fake = fakeIngest(() => ({ status: 401 }))
    servers.push(fake.server)
    const messages: string[] = []
    const client = new IngestClient({ baseUrl: await listen(fake.server), key: 'wrong', backoff: fast, log: m => messages.push(m) })
    client.enqueue(makeSamples(50))
    const unsent = await client.close(300)
    expect(unsent).toBe(50)
    expect(fake.stored.size).toBe(0)
    expect(messages.join('\n')).toMatch(/401.*gateway key/)
  })

  it('drops only the oldest samples, and counts them, when the bound is hit', async () => {
    const fake = fakeIngest(() => ({ status: 200 }))
    servers.push(fake.server)
    const messages: string[] = []
    const client = new IngestClient({ baseUrl: await listen(fake.server), key: 'k', maxBuffered: 100, backoff: fast, log: m => messages.push(m) })
    const samples = makeSamples(150)
    client.enqueue(samples)
    expect(client.stats).toMatchObject({ dropped: 50, buffered: 100 })
    await client.idle()
    expect([...fake.stored.keys()]).toEqual(samples.slice(50).map(s => `${s.tag}|${s.time}`))
    expect(messages.join('\n')).toMatch(/buffer full.*50 dropped/)
  })
})

describe('retry timing', () => {
  it('backs off exponentially with jitter between half and all of the step, capped', () => {
    const settings = { initialMs: 500, maxMs: 60_000 }
    expect(backoffDelay(1, settings, () => 0)).toBe(250)
    expect(backoffDelay(1, settings, () => 0.999999)).toBeCloseTo(500, 3)
    expect(backoffDelay(4, settings, () => 0)).toBe(2_000)
    expect(backoffDelay(30, settings, () => 1)).toBe(60_000)
  })

  it('reads Retry-After as seconds or as an HTTP-date (RFC 9110 §10.2.3)', () => {
    expect(parseRetryAfter('120')).toBe(120_000)
    const now = Date.parse('Wed, 21 Oct 2015 07:28:00 GMT')
    expect(parseRetryAfter('Wed, 21 Oct 2015 07:28:30 GMT', now)).toBe(30_000)
    expect(parseRetryAfter(null)).toBeUndefined()
    expect(parseRetryAfter('soon')).toBeUndefined()
  })
})
