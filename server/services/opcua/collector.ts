import {
  AttributeIds, ClientMonitoredItemGroup, DataChangeFilter, DataChangeTrigger, DataType, DeadbandType,
  StatusCodes, TimestampsToReturn, type ClientSession, type DataValue,
} from 'node-opcua-client'
import { qualityOfStatusCode, sampleTimeOf } from '#shared/opcua/statusQuality'
import type { Db } from '../../utils/db'
import { isDatabaseUnavailable } from '../../utils/dbUnavailable'
import { newestSampleTimes, type CollectorConfig, type CollectorStatus } from './connectionRecords'
import { createPlantClient, userIdentityOf } from './plantClient'
import { SampleBuffer, type CollectedSample } from './sampleBuffer'

export interface CollectorOptions {
  /** Where the client keeps its application certificate (made on first use). */
  pkiDir: string
  /** Longest wait between reconnection attempts; they start at 1 s and double. */
  maxBackoffMs: number
}

const FLUSH_MS = 500
const sleep = (ms: number) => new Promise(resolve => setTimeout(resolve, ms))

/**
 * Reads one plant OPC UA server for as long as it runs: connects, subscribes to the mapped
 * variables with monitored items, fills any gap from the server's history (HistoryRead, when it
 * offers it), and hands each value to the sample buffer. When the connection drops it starts over
 * after a doubling wait. It only ever reads: it sends session, subscription, monitored-item and
 * HistoryRead requests — never Write, Call, HistoryUpdate or node management.
 */
export class Collector {
  private stopped = false
  private running: Promise<void> | undefined
  private endSession: (() => void) | undefined
  private readonly buffer: SampleBuffer
  private readonly arrivals: number[] = []
  readonly status: CollectorStatus

  constructor(private readonly db: Db, readonly config: CollectorConfig, private readonly options: CollectorOptions) {
    this.buffer = new SampleBuffer(db, config, message => this.recordError(message))
    this.status = {
      state: 'connecting', stateSinceMs: Date.now(), valuesPerMinute: 0, reconnects: 0, backfilled: 0, lastError: null, timeBasis: new Map(),
    }
  }

  start() {
    this.running ??= Promise.all([this.sessionLoop(), this.flushLoop()]).then(() => undefined)
  }

  /** Ends the session and stores what is buffered (as far as the database allows). */
  async stop() {
    this.stopped = true
    this.endSession?.()
    await this.running
    this.setState('stopped')
  }

  /** Values received in the last minute. */
  valuesPerMinute(nowMs = Date.now()) {
    while (this.arrivals.length > 0 && this.arrivals[0]! < nowMs - 60_000) this.arrivals.shift()
    return this.arrivals.length
  }

  private recordError(message: string) {
    this.status.lastError = { message: message.slice(0, 500), atMs: Date.now() }
  }

  private setState(state: CollectorStatus['state']) {
    if (this.status.state !== state) Object.assign(this.status, { state, stateSinceMs: Date.now() })
  }

  private async flushLoop() {
    let wait = FLUSH_MS
    while (!this.stopped || this.buffer.size > 0) {
      try {
        await this.buffer.flush()
        wait = FLUSH_MS
      }
      catch (err) {
        this.recordError(isDatabaseUnavailable(err) ? `database unavailable, ${this.buffer.size} values held: ${(err as Error).message}` : (err as Error).message)
        if (this.stopped) return // a stopping collector does not wait out an outage; the next owner backfills
        wait = Math.min(wait * 2, 5_000)
      }
      if (!this.stopped) await sleep(wait)
    }
  }

  private async sessionLoop() {
    let attempt = 0
    while (!this.stopped) {
      const connected = await this.runSession().catch((err) => {
        this.recordError(`${this.config.endpointUrl}: ${(err as Error).message}`)
        return false
      })
      if (this.stopped) return
      attempt = connected ? 1 : attempt + 1
      this.status.reconnects++
      this.setState('retrying')
      await this.interruptibleSleep(Math.min(this.options.maxBackoffMs, 1000 * 2 ** (attempt - 1)))
    }
  }

  private interruptibleSleep(ms: number) {
    return new Promise<void>((resolve) => {
      const timer = setTimeout(resolve, ms)
      this.endSession = () => {
        clearTimeout(timer)
        resolve()
      }
    })
  }

  /** One session from connect to loss; true when it got as far as subscribing. */
  private async runSession(): Promise<boolean> {
    const client = createPlantClient(this.config, this.options.pkiDir, 'Brinkline collector')
    const lost = new Promise<string>((resolve) => {
      this.endSession = () => resolve('stopped')
      client.on('connection_lost', () => resolve('connection lost'))
      client.on('start_reconnection', () => resolve('connection lost'))
      client.on('close', () => resolve('connection closed'))
    })
    let subscribed = false
    try {
      this.setState('connecting')
      await client.connect(this.config.endpointUrl)
      const session = await client.createSession(userIdentityOf(this.config))
      session.on('session_closed', () => this.endSession?.())
      session.on('keepalive_failure', () => this.endSession?.())
      // Where each tag's record ends is taken before subscribing: the subscription's first value
      // is the newest one, and the gap lies before it.
      const heldUntil = await this.newestHeld()
      const subscription = await this.subscribe(session)
      subscription.on('terminated', () => this.endSession?.())
      subscribed = true
      this.setState('connected')
      await this.backfill(session, heldUntil)
      const reason = await lost
      if (reason !== 'stopped') this.recordError(`${this.config.endpointUrl}: ${reason}`)
      await session.close().catch(() => {})
    }
    finally {
      await client.disconnect().catch(() => {})
    }
    return subscribed
  }

  private async subscribe(session: ClientSession) {
    const subscription = await session.createSubscription2({
      requestedPublishingInterval: this.config.publishingIntervalMs,
      requestedLifetimeCount: 120,
      requestedMaxKeepAliveCount: 10,
      maxNotificationsPerPublish: 0,
      publishingEnabled: true,
      priority: 10,
    })
    const mappings = this.config.mappings
    if (mappings.length === 0) return subscription
    // Every change counts, a repeated value with a new timestamp too (StatusValueTimestamp), and
    // the server queues changes between publishes instead of keeping only the newest.
    const group = ClientMonitoredItemGroup.create(subscription,
      mappings.map(m => ({ nodeId: m.nodeId, attributeId: AttributeIds.Value })),
      {
        samplingInterval: this.config.samplingIntervalMs, discardOldest: false, queueSize: 1000,
        filter: new DataChangeFilter({ trigger: DataChangeTrigger.StatusValueTimestamp, deadbandType: DeadbandType.None }),
      },
      TimestampsToReturn.Both)
    group.on('changed', (_item, dataValue: DataValue, index: number) => {
      const mapping = mappings[index]
      if (mapping) this.accept(mapping.tagCode, [dataValue])
    })
    await new Promise<void>((resolve, reject) => {
      group.once('initialized', () => resolve())
      group.once('err', (message: string) => reject(new Error(message)))
    })
    const refused = group.monitoredItems.map((item, i) => [mappings[i]!.nodeId, item.statusCode] as const)
      .filter(([, code]) => code && code.isNotGood())
    if (refused.length > 0) this.recordError(`server refused ${refused.map(([n, c]) => `${n} (${c.name})`).join(', ')}`)
    return subscription
  }

  /** Newest time held per tag, stored or still buffered. */
  private async newestHeld(): Promise<Map<string, number>> {
    const codes = this.config.mappings.map(m => m.tagCode)
    const stored = await newestSampleTimes(this.db, this.config.siteId, codes).catch((err) => {
      this.recordError(`history backfill skipped: ${(err as Error).message}`)
      return new Map<string, number>()
    })
    for (const code of codes) {
      const buffered = this.buffer.newestTimeOf(code)
      if (buffered !== undefined && buffered > (stored.get(code) ?? -Infinity)) stored.set(code, buffered)
    }
    return stored
  }

  /** Asks the server's history for what was recorded after the newest value held, tag by tag. */
  private async backfill(session: ClientSession, heldUntil: Map<string, number>) {
    const end = new Date()
    for (const mapping of this.config.mappings) {
      const from = heldUntil.get(mapping.tagCode)
      if (from === undefined) continue // nothing held yet: the subscription's first value starts the record
      const result = await session.readHistoryValue({ nodeId: mapping.nodeId }, new Date(from), end,
        { timestampsToReturn: TimestampsToReturn.Both })
      if (result.statusCode.equals(StatusCodes.BadHistoryOperationUnsupported)) continue
      if (result.statusCode.isNotGood()) {
        this.recordError(`history of ${mapping.nodeId}: ${result.statusCode.name}`)
        continue
      }
      const values = (result.historyData as { dataValues?: DataValue[] } | null)?.dataValues ?? []
      const newer = values.filter(v => (sampleTimeOf(v.sourceTimestamp, v.serverTimestamp)?.timeMs ?? -Infinity) > from)
      this.status.backfilled += this.accept(mapping.tagCode, newer)
    }
  }

  /** Turns data values into samples for the buffer; returns how many it took. */
  private accept(tagCode: string, dataValues: DataValue[]): number {
    const samples: CollectedSample[] = []
    for (const dv of dataValues) {
      const time = sampleTimeOf(dv.sourceTimestamp, dv.serverTimestamp)
      const value = numericValue(dv)
      if (!time || value === null) {
        this.recordError(`${tagCode}: a value without ${time ? 'a number' : 'a timestamp'} (${dv.statusCode.name}) was skipped`)
        continue
      }
      samples.push({ tag: tagCode, time: time.timeMs, value, quality: qualityOfStatusCode(dv.statusCode.value) })
      this.status.timeBasis.set(tagCode, time.basis)
    }
    const now = Date.now()
    for (let i = 0; i < samples.length; i++) this.arrivals.push(now)
    this.buffer.push(samples)
    return samples.length
  }
}

const NUMERIC = new Set([DataType.Double, DataType.Float, DataType.Int16, DataType.Int32, DataType.UInt16, DataType.UInt32,
  DataType.Byte, DataType.SByte])

/** The value as a number, when it is one (booleans as 0/1); null for text, arrays, empty values. */
function numericValue(dv: DataValue): number | null {
  const v = dv.value
  if (!v || v.arrayType !== 0) return null
  if (v.dataType === DataType.Boolean) return v.value ? 1 : 0
  if (NUMERIC.has(v.dataType) && typeof v.value === 'number' && Number.isFinite(v.value)) return v.value
  return null
}
