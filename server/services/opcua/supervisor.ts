import { hostname } from 'node:os'
import { randomBytes } from 'node:crypto'
import type { ReservedSql } from 'postgres'
import type { Db } from '../../utils/db'
import { isDatabaseUnavailable } from '../../utils/dbUnavailable'
import { Collector, type CollectorOptions } from './collector'
import { enabledConnections, writeConnectionStatus } from './connectionRecords'

// First key of the session advisory lock that makes one server instance the owner of a connection
// (second key: the connection id). Other locks of this product use other first keys.
const OPCUA_LOCK = 72_417

export interface SupervisorOptions extends CollectorOptions {
  pollMs: number
  /** Resolves once the schema is current (migrations run at start-up); retried each poll until it does. */
  ready: () => Promise<void>
}

/**
 * Runs a collector for every enabled connection this instance owns. Ownership is a session-level
 * advisory lock held on one reserved database connection: whichever instance takes it first
 * collects, the others skip the connection, and if the owner dies PostgreSQL frees the lock and
 * another instance takes over (and backfills from the server's history). A configuration change
 * (config_version) restarts the collector; a disabled or deleted connection stops it.
 */
export class OpcuaSupervisor {
  readonly owner = `${hostname()}:${process.pid}:${randomBytes(3).toString('hex')}`
  private readonly collectors = new Map<number, Collector>()
  private readonly reported = new Map<number, { reconnects: number, backfilled: number }>()
  private lockSession: ReservedSql | undefined
  private timer: ReturnType<typeof setTimeout> | undefined
  private stopped = false

  constructor(private readonly db: Db, private readonly options: SupervisorOptions) {}

  start() {
    const loop = async () => {
      await this.poll().catch(err => console.error('[opcua] supervisor:', (err as Error).message))
      if (!this.stopped) this.timer = setTimeout(loop, this.options.pollMs)
    }
    void loop()
  }

  async stop() {
    this.stopped = true
    clearTimeout(this.timer)
    await Promise.all([...this.collectors.values()].map(c => c.stop()))
    await Promise.all([...this.collectors.values()].map(c => this.report(c)))
    this.collectors.clear()
    this.lockSession?.release()
  }

  private async poll() {
    await this.options.ready()
    await this.holdLocks()
    const configs = await enabledConnections(this.db)
    const wanted = new Map(configs.map(c => [c.id, c]))
    for (const [id, collector] of this.collectors) {
      const config = wanted.get(id)
      if (!config || config.configVersion !== collector.config.configVersion) await this.release(id)
    }
    for (const config of configs) {
      if (this.collectors.has(config.id) || !this.lockSession) continue
      const [row] = await this.lockSession<{ ok: boolean }[]>`select pg_try_advisory_lock(${OPCUA_LOCK}, ${config.id}) as ok`
      if (!row?.ok) continue
      const collector = new Collector(this.db, config, this.options)
      this.collectors.set(config.id, collector)
      this.reported.set(config.id, { reconnects: 0, backfilled: 0 })
      collector.start()
    }
    await Promise.all([...this.collectors.values()].map(c => this.report(c)))
  }

  /**
   * Keeps the lock session alive. When the database dropped it (an outage), the locks went with
   * it: a new session takes them again; a connection another instance took meanwhile is given up
   * here, its buffered values flushed as far as possible (duplicates are harmless).
   */
  private async holdLocks() {
    if (this.lockSession) {
      const alive = await this.lockSession`select 1`.then(() => true, () => false)
      if (alive) return
      this.lockSession.release()
      this.lockSession = undefined
    }
    this.lockSession = await this.db.$sql.reserve()
    for (const id of [...this.collectors.keys()]) {
      const [row] = await this.lockSession<{ ok: boolean }[]>`select pg_try_advisory_lock(${OPCUA_LOCK}, ${id}) as ok`
      if (!row?.ok) await this.release(id, false)
    }
  }

  private async release(id: number, unlock = true) {
    const collector = this.collectors.get(id)
    this.collectors.delete(id)
    if (collector) {
      await collector.stop()
      await this.report(collector)
    }
    const session = this.lockSession
    if (unlock && session) await session`select pg_advisory_unlock(${OPCUA_LOCK}, ${id})`.catch(() => {})
  }

  private async report(collector: Collector) {
    const id = collector.config.id
    const status = collector.status
    status.valuesPerMinute = collector.valuesPerMinute()
    const before = this.reported.get(id) ?? { reconnects: 0, backfilled: 0 }
    const deltas = { reconnects: status.reconnects - before.reconnects, backfilled: status.backfilled - before.backfilled }
    try {
      await writeConnectionStatus(this.db, id, status.state === 'stopped' ? null : this.owner, status, deltas)
      this.reported.set(id, { reconnects: status.reconnects, backfilled: status.backfilled })
    }
    catch (err) {
      // The database away is expected (the next poll writes the status again); anything else is a bug to see.
      if (!isDatabaseUnavailable(err)) console.error(`[opcua] status of connection ${id}:`, (err as Error).message)
    }
  }
}
