// Gateway client for POST {baseUrl}/api/ingest. Samples are buffered in memory and sent in
// batches; a batch leaves the buffer only when the server has answered for it, so an outage
// loses nothing (ingest is idempotent on (tag, time), so resending after an unclear failure is
// safe). Only when the buffer bound is hit are the oldest samples dropped, and counted.
import type { Quality } from './sensor'
import { backoffDelay, parseRetryAfter, type BackoffSettings } from '../../shared/utils/retryDelay'

export interface IngestSample {
  tag: string
  /** ISO 8601 with Z. */
  time: string
  value: number
  quality: Quality
}

export interface IngestClientOptions {
  baseUrl: string
  key: string
  maxBuffered?: number
  maxBatch?: number
  backoff?: BackoffSettings
  /** Longest Retry-After the client will honour; a longer one is capped. */
  maxRetryAfterMs?: number
  requestTimeoutMs?: number
  random?: () => number
  log?: (message: string) => void
}

export interface IngestStats {
  buffered: number
  /** Samples the server accepted as new. */
  accepted: number
  /** Samples the server already had (resends after an unclear failure land here). */
  duplicates: number
  /** Samples the server refused as invalid; they are not retried. */
  rejected: number
  /** Samples dropped because the buffer bound was hit. */
  dropped: number
  failedAttempts: number
  lastError?: string
}

interface IngestResponse {
  accepted?: number
  duplicates?: number
  rejected?: { index: number; field: string; reason: string }[]
}

type SendOutcome =
  | { kind: 'done'; response: IngestResponse }
  | { kind: 'retry'; error: string; retryAfterMs?: number }
  | { kind: 'unauthorised'; error: string }
  | { kind: 'refused'; error: string; status: number }

const WARNING_INTERVAL_MS = 10_000

export class IngestClient {
  private readonly queue: IngestSample[] = []
  private inFlight = 0
  private batchLimit: number
  private failures = 0
  private pump: Promise<void> | undefined
  private wakeSleeper: (() => void) | undefined
  private closingDeadline: number | undefined
  private lastDropWarning = 0
  readonly stats: IngestStats = { buffered: 0, accepted: 0, duplicates: 0, rejected: 0, dropped: 0, failedAttempts: 0 }

  private readonly maxBuffered: number
  private readonly maxBatch: number
  private readonly backoff: BackoffSettings
  private readonly maxRetryAfterMs: number
  private readonly requestTimeoutMs: number
  private readonly random: () => number
  private readonly log: (message: string) => void
  private readonly endpoint: string

  constructor(private readonly options: IngestClientOptions) {
    this.maxBuffered = options.maxBuffered ?? 200_000
    this.maxBatch = Math.min(options.maxBatch ?? 5_000, 5_000)
    this.batchLimit = this.maxBatch
    this.backoff = options.backoff ?? { initialMs: 500, maxMs: 60_000 }
    this.maxRetryAfterMs = options.maxRetryAfterMs ?? 300_000
    this.requestTimeoutMs = options.requestTimeoutMs ?? 30_000
    this.random = options.random ?? Math.random
    this.log = options.log ?? (message => console.warn(`[ingest] ${message}`))
    this.endpoint = `${options.baseUrl.replace(/\/+$/, '')}/api/ingest`
  }

  /** Buffer samples and make sure a send is under way. */
  enqueue(samples: readonly IngestSample[]): void {
    this.queue.push(...samples)
    const excess = this.queue.length + this.inFlight - this.maxBuffered
    if (excess > 0) this.dropOldest(Math.min(excess, this.queue.length))
    this.stats.buffered = this.queue.length + this.inFlight
    if (this.closingDeadline === undefined) this.ensurePumping()
  }

  /** Resolves once the buffer has been emptied (waits through any retries). */
  async idle(): Promise<void> {
    while (this.pump) await this.pump
  }

  /**
   * Final flush: keep sending until the buffer is empty or the time is up, cutting any backoff
   * wait short. Resolves to the number of samples still unsent.
   */
  async close(flushTimeoutMs = 10_000): Promise<number> {
    this.closingDeadline = Date.now() + flushTimeoutMs
    this.wakeSleeper?.()
    this.ensurePumping()
    await this.pump
    return this.queue.length + this.inFlight
  }

  private dropOldest(count: number): void {
    this.queue.splice(0, count)
    this.stats.dropped += count
    const now = Date.now()
    if (now - this.lastDropWarning >= WARNING_INTERVAL_MS) {
      this.lastDropWarning = now
      this.log(`buffer full (${this.maxBuffered} samples): dropped the oldest, ${this.stats.dropped} dropped so far`)
    }
  }

  private ensurePumping(): void {
    this.pump ??= this.drain().finally(() => { this.pump = undefined })
  }

  private timeLeft(): number {
    return this.closingDeadline === undefined ? Infinity : this.closingDeadline - Date.now()
  }

  private async drain(): Promise<void> {
    while (this.queue.length > 0 && this.timeLeft() > 0) {
      const batch = this.queue.splice(0, this.batchLimit)
      this.inFlight = batch.length
      const outcome = await this.send(batch)
      this.inFlight = 0
      const waitMs = this.settle(batch, outcome)
      this.stats.buffered = this.queue.length
      if (waitMs > 0) await this.sleep(Math.min(waitMs, this.timeLeft()))
    }
  }

  /** Book the outcome of one batch; returns how long to wait before the next attempt. */
  private settle(batch: IngestSample[], outcome: SendOutcome): number {
    if (outcome.kind === 'done') {
      this.failures = 0
      this.batchLimit = Math.min(this.maxBatch, this.batchLimit * 2)
      this.stats.accepted += outcome.response.accepted ?? 0
      this.stats.duplicates += outcome.response.duplicates ?? 0
      const rejected = outcome.response.rejected ?? []
      this.stats.rejected += rejected.length
      if (rejected.length > 0) {
        const first = rejected[0]!
        this.log(`server rejected ${rejected.length} sample(s), e.g. ${batch[first.index]?.tag ?? '?'} ${first.field}: ${first.reason}`)
      }
      return 0
    }
    this.stats.failedAttempts++
    this.stats.lastError = outcome.error
    if (outcome.kind === 'refused') return this.handleRefusedBatch(batch, outcome)
    // Put the batch back in front, so it goes again first and stays in time order.
    this.queue.unshift(...batch)
    this.failures++
    if (outcome.kind === 'unauthorised') {
      // A wrong key needs a person; keep everything and ask again at the slowest pace.
      this.log(`${outcome.error}: check the gateway key; keeping ${this.queue.length} samples`)
      return this.backoff.maxMs
    }
    const delay = Math.max(
      backoffDelay(this.failures, this.backoff, this.random),
      Math.min(outcome.retryAfterMs ?? 0, this.maxRetryAfterMs)
    )
    if (this.failures === 1 || this.failures % 10 === 0)
      this.log(`${outcome.error}; retry ${this.failures} in ${Math.round(delay)} ms, ${this.queue.length} samples buffered`)
    return delay
  }

  // 400/413: the batch itself is the problem. Halve it until the server takes it or a single
  // sample is left that it will never take; only that one is given up (and counted as rejected).
  private handleRefusedBatch(batch: IngestSample[], outcome: { error: string; status: number }): number {
    if (batch.length > 1) {
      this.batchLimit = Math.max(1, Math.floor(batch.length / 2))
      this.queue.unshift(...batch)
      return 0
    }
    this.stats.rejected++
    this.log(`${outcome.error}: gave up on ${batch[0]!.tag} at ${batch[0]!.time}`)
    return 0
  }

  private async send(batch: IngestSample[]): Promise<SendOutcome> {
    let response: Response
    try {
      response = await fetch(this.endpoint, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${this.options.key}` },
        body: JSON.stringify({ samples: batch }),
        signal: AbortSignal.timeout(this.requestTimeoutMs),
      })
    }
    catch (error) {
      const cause = (error as { cause?: { code?: string } }).cause?.code
      return { kind: 'retry', error: `network error: ${cause ?? (error as Error).message}` }
    }
    const text = await response.text().catch(() => '')
    const status = response.status
    if (response.ok) {
      try { return { kind: 'done', response: JSON.parse(text) as IngestResponse } }
      catch { return { kind: 'done', response: { accepted: batch.length } } }
    }
    const error = `HTTP ${status}${text ? ` ${text.slice(0, 200)}` : ''}`
    if (status === 401 || status === 403) return { kind: 'unauthorised', error }
    if (status === 400 || status === 413) return { kind: 'refused', error, status }
    return { kind: 'retry', error, retryAfterMs: parseRetryAfter(response.headers.get('retry-after')) }
  }

  private sleep(ms: number): Promise<void> {
    return new Promise<void>((resolve) => {
      const timer = setTimeout(done, ms)
      function done() { clearTimeout(timer); resolve() }
      this.wakeSleeper = done
    }).finally(() => { this.wakeSleeper = undefined })
  }
}
