import { Transform, type Readable } from 'node:stream'
import { createError, getRequestHeader, type H3Error, type H3Event } from 'h3'
import { describeBytes } from './bodyLimits'

/**
 * Request bodies read within a byte limit (issue 13 item 6), so no route buffers, parses or
 * stores more than its limit whatever the client declares or streams.
 *
 * - A declared Content-Length over the limit is refused before a byte is read.
 * - Otherwise the body is counted while it streams: h3's readers (readBody, readRawBody and so
 *   validBody) take it from `req.body`, which is set here to a reader that stops at the limit;
 *   a streaming route takes `limitedBodyStream(event)` instead of the raw request.
 * - After a refusal the rest of the body is read into nothing, so the client can read the 413
 *   rather than a reset; once it has been answered and sends more than DISCARD_AFTER_ANSWER_BYTES
 *   still, the connection is closed (Go's net/http drains 256 KiB the same way [from memory]).
 */
const DISCARD_AFTER_ANSWER_BYTES = 256 * 1024

interface LimitedRequest { body?: Promise<Buffer> }
const LIMIT = Symbol('bodyLimit')
type RequestWithLimit = H3Event['node']['req'] & LimitedRequest & { [LIMIT]?: number }

/** Refuses an over-limit declared length at once, and makes every later read of the body stop at `limit` bytes. */
export function limitRequestBody(event: H3Event, limit: number): void {
  const req = event.node.req as RequestWithLimit
  req[LIMIT] = limit
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > limit) throw tooLarge(event, `its declared ${declared} bytes exceed`)
  const chunked = /\bchunked\b/i.test(getRequestHeader(event, 'transfer-encoding') ?? '')
  // Without a body h3's readers answer undefined, as before; only a body gets the counting reader.
  if (!(declared > 0) && !chunked) return
  let reading: Promise<Buffer> | undefined
  // A getter, so the body is only read when a handler asks for it (after its guard), and once.
  Object.defineProperty(req, 'body', { configurable: true, get: () => (reading ??= readWithinLimit(event)) })
}

/** The body as a stream that fails with a 413 once it passes this route's limit (for routes that stream, such as the CSV import). */
export function limitedBodyStream(event: H3Event): Readable {
  const req = event.node.req as RequestWithLimit
  const limit = limitOf(req)
  let size = 0
  const counted = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      size += chunk.length
      if (size <= limit) return done(null, chunk)
      req.unpipe(counted)
      done(tooLarge(event, 'it grew past'))
    },
  })
  req.on('aborted', () => counted.destroy(new Error('the upload was interrupted')))
  return req.pipe(counted)
}

function readWithinLimit(event: H3Event): Promise<Buffer> {
  const req = event.node.req as RequestWithLimit
  const limit = limitOf(req)
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let size = 0
    const onData = (chunk: Buffer) => {
      size += chunk.length
      if (size <= limit) return void chunks.push(chunk)
      req.off('data', onData)
      chunks.length = 0
      reject(tooLarge(event, 'it grew past'))
    }
    req.on('data', onData).once('end', () => resolve(Buffer.concat(chunks))).once('error', reject)
  })
}

function limitOf(req: RequestWithLimit): number {
  const limit = req[LIMIT]
  // The middleware sets it on every /api request; a route outside /api reading a body is a programming error.
  if (limit === undefined) throw new Error('[bodyLimits] no body limit was set for this request')
  return limit
}

/** The 413, naming the limit; from here on the rest of the body is read into nothing. */
function tooLarge(event: H3Event, what: string): H3Error {
  const limit = limitOf(event.node.req as RequestWithLimit)
  discardRest(event)
  return createError({
    statusCode: 413,
    message: `body: ${what} the limit of ${describeBytes(limit)} for ${event.method} ${event.path.split('?')[0]}`,
  })
}

function discardRest(event: H3Event) {
  const { req, res } = event.node
  let afterAnswer = 0
  req.on('data', (chunk: Buffer) => {
    if (!res.writableFinished) return
    afterAnswer += chunk.length
    if (afterAnswer > DISCARD_AFTER_ANSWER_BYTES) req.socket.destroy()
  })
  req.resume()
}
