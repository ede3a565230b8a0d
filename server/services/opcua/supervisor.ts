import { hostname } from 'node:os'
import { randomBytes } from 'node:crypto'
import type { Sql } from 'postgres'
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
  /**
   * A client of one connection (max 1) that holds the ownership locks, apart from the pool. Not a
   * connection reserved from the pool: postgres.js 3.4 loses a query sent on a reserved connection
   * the database has dropped (it throws inside the library and the promise never settles), which
   * stalled the supervisor for good after a database restart.
   */
  lockSql: Sql
}

/**
 * Runs a collector for every enabled connection this instance owns. Ownership is a session-level
 * advisory lock held on a database connection of its own: whichever instance takes it first
 * collects, the others skip the connection, and if the owner dies PostgreSQL frees the lock and
 * another instance takes over (and backfills from the server's history). A configuration change
 * (config_version) restarts the collector; a disabled or deleted connection stops it.
 */
export class OpcuaSupervisor {
  readonly owner = `${hostname()}:${process.pid}:${randomBytes(3).toString('hex')}`
  private readonly collectors = new Map<number, Collector>()
  private readonly reported = new Map<number, { reconnects: number, backfilled: number }>()
  /** Backend pid of the session holding this instance's locks: a new pid means that session (and its locks) ended. */
  private lockPid: number | undefined
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
    await this.options.lockSql.end({ timeout: 5 }).catch(() => {})
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
      if (this.collectors.has(config.id)) continue
      if (!await this.tryLock(config.id)) continue
      const collector = new Collector(this.db, config, this.options)
      this.collectors.set(config.id, collector)
      this.reported.set(config.id, { reconnects: 0, backfilled: 0 })
      collector.start()
    }
    await Promise.all([...this.collectors.values()].map(c => this.report(c)))
  }

  /**
   * Checks the lock session is the one that took the locks. After the database dropped it (an
   * outage), the lock client has opened a new session without them: the locks are taken again
   * there, and a connection another instance took meanwhile is given up here, its buffered values
   * flushed as far as possible (duplicates are harmless).
   */
  private async holdLocks() {
    const [row] = await this.options.lockSql<{ pid: number }[]>`select pg_backend_pid() as pid`
    if (row!.pid === this.lockPid) return
    this.lockPid = row!.pid
    for (const id of [...this.collectors.keys()]) {
      if (!await this.tryLock(id)) await this.release(id, false)
    }
  }

  private async tryLock(id: number): Promise<boolean> {
    const [row] = await this.options.lockSql<{ ok: boolean }[]>`select pg_try_advisory_lock(${OPCUA_LOCK}, ${id}) as ok`
    return row?.ok === true
  }

  private async release(id: number, unlock = true) {
    const collector = this.collectors.get(id)
    this.collectors.delete(id)
    if (collector) {
      await collector.stop()
      await this.report(collector)
    }
    // Session locks stack when taken twice (a session replaced between two of our queries): unlock until none is left.
    for (let i = 0; unlock && i < 10; i++) {
      const [row] = await this.options.lockSql<{ ok: boolean }[]>`select pg_advisory_unlock(${OPCUA_LOCK}, ${id}) as ok`.catch(() => [{ ok: false }])
      if (!row?.ok) break
    }
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
