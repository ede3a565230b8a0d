import { request } from 'node:http'
import { afterAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { MAX_INGEST_BYTES } from '../../shared/schemas/ingest'
import { MAX_UPLOAD_BYTES, PREVIEW_MAX_BYTES } from '../../shared/schemas/upload'
import { setupBuiltServer } from '../support/server'
import { call, signInAs } from '../support/session'
import { testSql } from '../support/db'
import { createTestGateway } from '../support/gateway'

await setupBuiltServer()
const sql = testSql()
afterAll(() => sql.end())

// Issue 13 item 6: every /api route reads its body within a limit. The checks send what fetch
// cannot: a length declared but never sent, and chunked bodies (no Content-Length, RFC 9112 §7.1)
// held open, so an answer that arrives before the body ends shows the server did not wait for it.

interface Answer { status: number, body: { message?: string, accepted?: number, header?: string[] } }

/** A raw HTTP/1.1 request: write chunks at will; `answered` settles on the response, whether or not the body was ended. */
function openRequest(path: string, headers: Record<string, string>) {
  const req = request(url(path), { method: 'POST', headers })
  const answered = new Promise<Answer>((resolve, reject) => {
    req.on('response', (res) => {
      let text = ''
      res.setEncoding('utf8').on('data', (c: string) => { text += c }).on('end', () => resolve({ status: res.statusCode!, body: JSON.parse(text) }))
    })
    req.on('error', reject)
  })
  return { req, answered }
}

function writeChunked(req: ReturnType<typeof request>, text: string, chunkBytes = 64 * 1024) {
  for (let i = 0; i < text.length; i += chunkBytes) req.write(text.slice(i, i + chunkBytes))
}

/** The answer to a body declared `bytes` long of which not one byte is sent. */
async function answerToDeclared(path: string, headers: Record<string, string>, bytes: number): Promise<Answer> {
  const { req, answered } = openRequest(path, { ...headers, 'content-length': String(bytes) })
  req.flushHeaders()
  try {
    return await answered
  }
  finally {
    req.destroy()
  }
}

/** The answer to `text` sent whole as a chunked body. */
function answerToChunked(path: string, headers: Record<string, string>, text: string, chunkBytes?: number): Promise<Answer> {
  const { req, answered } = openRequest(path, headers)
  writeChunked(req, text, chunkBytes)
  req.end()
  return answered
}

const T0 = Date.UTC(2026, 1, 2, 6, 0, 0)
const samplesAt = (fromMs: number, n: number) => Array.from({ length: n }, (_, i) => ({ tag: 'TI-401', time: fromMs + i * 1000, value: 20 + (i % 100) / 10 }))
const storedBetween = async (fromMs: number, toMs: number) =>
  Number((await sql`select count(*)::int as n from samples s join tags t on t.id = s.tag_id
    where t.code = 'TI-401' and s.time >= ${new Date(fromMs)} and s.time <= ${new Date(toMs)}`)[0]!.n)

describe('request body limits (issue 13 item 6)', () => {
  it('refuses a 100 MB declared sign-in body with 413 naming the limit, without waiting for a byte of it', async () => {
    const res = await answerToDeclared('/api/public/sign-in', { 'content-type': 'application/json' }, 100 * 1024 * 1024)
    expect(res.status).toBe(413)
    expect(res.body.message).toBe('body: its declared 104857600 bytes exceed the limit of 64 KiB (65536 bytes) for POST /api/public/sign-in')
  })

  it('refuses a chunked ingest once it passes 4 MiB and stores none of its samples', async () => {
    const gateway = await createTestGateway('chunked-oversized-gateway')
    const samples = samplesAt(T0, 100)
    // A valid batch, then an unknown field that carries it past the limit: read whole, it would be stored.
    const prefix = JSON.stringify({ samples }).slice(0, -1)
    const body = `${prefix},"padding":"${'x'.repeat(MAX_INGEST_BYTES + 16 * 1024 - prefix.length)}"}`
    const res = await answerToChunked('/api/ingest', { 'content-type': 'application/json', 'authorization': `Bearer ${gateway.key}` }, body)
    expect(res.status).toBe(413)
    expect(res.body.message).toBe('body: it grew past the limit of 4 MiB (4194304 bytes) for POST /api/ingest')
    expect(await storedBetween(T0, T0 + 99_000)).toBe(0)
    const gateways = await call('/api/admin/gateways', { cookie: gateway.adminCookie })
    expect(gateways.body.find((g: { id: number }) => g.id === gateway.id)).toMatchObject({ acceptedCount: 0, failedBatchCount: 1 })
  })

  it('takes a chunked ingest within the limit whole', async () => {
    const gateway = await createTestGateway('chunked-gateway')
    const from = T0 + 3_600_000
    const headers = { 'content-type': 'application/json', 'authorization': `Bearer ${gateway.key}` }
    const res = await answerToChunked('/api/ingest', headers, JSON.stringify({ samples: samplesAt(from, 3000) }), 4096)
    expect(res.status).toBe(200)
    expect(res.body.accepted, JSON.stringify(res.body).slice(0, 600)).toBe(3000)
    expect(await storedBetween(from, from + 2_999_000)).toBe(3000)
  })

  describe('CSV preview', () => {
    const header = 'Timestamp,Tag,Value\n'
    const line = '2025-08-04T14:00:00Z,TI-401,38.2\n'
    /** A CSV text of exactly `bytes` bytes (ASCII): whole lines, then part of one. */
    const csvOf = (bytes: number) => (header + line.repeat(Math.ceil(bytes / line.length))).slice(0, bytes)

    it('answers 413 as soon as a chunked preview passes the limit, while the body is still coming', async () => {
      const cookie = await signInAs('engineer')
      const { req, answered } = openRequest('/api/uploads/preview?siteId=1', { 'content-type': 'text/csv', cookie })
      writeChunked(req, csvOf(PREVIEW_MAX_BYTES + 1))
      const res = await answered
      req.destroy()
      expect(res.status).toBe(413)
      expect(res.body.message).toBe('body: it grew past the limit of 256 KiB (262144 bytes) for POST /api/uploads/preview')
    })

    it('previews a chunked body of exactly the limit', async () => {
      const cookie = await signInAs('engineer')
      const res = await answerToChunked('/api/uploads/preview?siteId=1', { 'content-type': 'text/csv', cookie }, csvOf(PREVIEW_MAX_BYTES))
      expect(res.status).toBe(200)
      expect(res.body.header).toEqual(['Timestamp', 'Tag', 'Value'])
    })
  })

  it('refuses an import whose declared length passes its limit before reading it', async () => {
    const cookie = await signInAs('engineer')
    const res = await answerToDeclared('/api/uploads/import?siteId=1&format=long', { 'content-type': 'text/csv', cookie }, MAX_UPLOAD_BYTES + 1)
    expect(res.status).toBe(413)
    expect(res.body.message).toContain('exceed the limit of 1 GiB (1073741824 bytes) for POST /api/uploads/import')
  })

  it('still signs in with an ordinary body', async () => {
    await expect(signInAs('operator')).resolves.toMatch(/=/)
  })
})
