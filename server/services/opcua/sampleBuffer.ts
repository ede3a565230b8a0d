import type { Db } from '../../utils/db'
import { ingestBatch } from '../ingest/ingestBatch'
import { countConnectionBatch } from './connectionRecords'

export interface CollectedSample { tag: string, time: number, value: number, quality: 'good' | 'uncertain' | 'bad' }

// Values the collector has received (and the OPC UA subscription has acknowledged to the
// server) wait here until a transaction has stored them: a database outage holds them in memory,
// oldest first, and they go in when it returns. Bounded so a long outage cannot exhaust memory;
// beyond the bound the oldest go (counted as an error, and the history backfill may recover them).
const MAX_BUFFERED = 500_000
const BATCH = 5_000
/**
 * A store that has not answered in this time is given up and tried again: a query caught by a
 * database restart must not hold the buffer for good. If the abandoned one committed after all,
 * the retry's rows are duplicates, which ingest ignores (idempotent on tag and time).
 */
export const STORE_TIMEOUT_MS = 30_000

function withinTime<T>(work: Promise<T>, ms: number): Promise<T> {
  let timer: ReturnType<typeof setTimeout> | undefined
  const late = new Promise<never>((_resolve, reject) => {
    timer = setTimeout(() => reject(new Error(`the database did not answer a store within ${ms / 1000} s; trying again`)), ms)
  })
  return Promise.race([work, late]).finally(() => clearTimeout(timer))
}

export class SampleBuffer {
  private queue: CollectedSample[] = []
  private flushing: Promise<void> | undefined
  dropped = 0

  constructor(private readonly db: Db, private readonly connection: { id: number, siteId: number },
    private readonly onError: (message: string) => void) {}

  get size() { return this.queue.length }

  /** Newest buffered time of a tag, so a backfill does not ask again for what is waiting here. */
  newestTimeOf(tag: string): number | undefined {
    for (let i = this.queue.length - 1; i >= 0; i--) if (this.queue[i]!.tag === tag) return this.queue[i]!.time
    return undefined
  }

  push(samples: CollectedSample[]) {
    this.queue.push(...samples)
    if (this.queue.length > MAX_BUFFERED) {
      const excess = this.queue.length - MAX_BUFFERED
      this.queue.splice(0, excess)
      this.dropped += excess
      this.onError(`buffer full during a database outage: ${this.dropped} oldest values dropped`)
    }
  }

  /** Stores everything buffered; on a database error keeps the rest and throws. One flush at a time. */
  flush(): Promise<void> {
    this.flushing ??= this.drain().finally(() => { this.flushing = undefined })
    return this.flushing
  }

  private async drain() {
    while (this.queue.length > 0) {
      const batch = this.queue.slice(0, BATCH)
      const newestMs = batch.reduce((m, s) => Math.max(m, s.time), -Infinity)
      const outcome = await withinTime(ingestBatch(this.db, {
        siteId: this.connection.siteId,
        items: batch,
        countAgainstSource: (tx, counts) => countConnectionBatch(tx, this.connection.id, counts, newestMs),
      }), STORE_TIMEOUT_MS)
      this.queue.splice(0, batch.length)
      const last = outcome.rejected.at(-1)
      if (last) this.onError(`${outcome.rejected.length} values refused; last: ${batch[last.index]?.tag ?? ''} ${last.field} ${last.reason}`)
    }
  }
}
