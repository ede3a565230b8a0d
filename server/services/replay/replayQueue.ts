import PgBoss from 'pg-boss'
import { sql, type SQL } from 'drizzle-orm'
import { databaseUrl, type DbTransaction } from '../../utils/db'

// Replays run as pg-boss jobs (a PostgreSQL job queue, in its own schema): a job outlives the
// page that asked for it and the server instance that took it, several wait their turn, and
// any instance may work them. The replay's row holds its progress and result; the job only
// names it.
const QUEUE = 'replay'
const SCHEMA = 'pgboss'
/** A job still active after this is taken to have lost its server, and is retried. */
const JOB_EXPIRE_S = 4 * 3600
/** A database outage mid-replay: try again a little later, twice. */
const RETRY = { retryLimit: 2, retryDelay: 30 }

interface ReplayJob { replayId: number }

let started: Promise<PgBoss> | undefined

/** This instance's queue client, started once (creating pg-boss's schema on first use). */
function startReplayQueue(): Promise<PgBoss> {
  started ??= (async () => {
    const boss = new PgBoss({ connectionString: databaseUrl(), schema: SCHEMA, max: 3, application_name: 'brinkline-replay' })
    boss.on('error', err => console.error('[replay] queue:', err.message))
    await boss.start()
    await boss.createQueue(QUEUE, { name: QUEUE, expireInSeconds: JOB_EXPIRE_S, ...RETRY })
    return boss
  })().catch((err) => {
    started = undefined
    throw err
  })
  return started
}

let working = false

/** Works this instance's share of the replay jobs, one at a time: a replay keeps the evaluation threads busy. */
export async function startReplayWorker(work: (replayId: number) => Promise<void>): Promise<void> {
  const boss = await startReplayQueue()
  if (working) return
  working = true
  await boss.work<ReplayJob>(QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => {
    if (job) await work(job.data.replayId)
  }).catch((err) => {
    working = false
    throw err
  })
}

export async function stopReplayQueue(): Promise<void> {
  const boss = await started?.catch(() => undefined)
  started = undefined
  working = false
  await boss?.stop({ graceful: false, wait: false })
}

/** Queues a replay in the caller's transaction, so the replay row and its job commit together; answers the job's id. */
export async function enqueueReplay(tx: DbTransaction, replayId: number): Promise<string> {
  // An instance without the worker (BRINKLINE_REPLAY_WORKER=0) still queues: another one works the job.
  const boss = await startReplayQueue()
  const jobId = await boss.send(QUEUE, { replayId } satisfies ReplayJob, { db: transactionExecutor(tx), singletonKey: String(replayId) })
  if (!jobId) throw new Error(`replay ${replayId} is already queued`)
  return jobId
}

/** Job states after which pg-boss will not run the job again. */
const FINISHED_JOB_STATES = new Set(['completed', 'cancelled', 'failed'])

/**
 * Whether pg-boss has given up a replay's job (failed through its retries, cancelled, or gone),
 * so a replay row still queued or running will never move again.
 */
export async function replayJobGivenUp(jobId: string): Promise<boolean> {
  const boss = await startReplayQueue()
  const job = await boss.getJobById(QUEUE, jobId, { includeArchive: true })
  return !job || FINISHED_JOB_STATES.has(job.state)
}

/**
 * pg-boss's statements ($1, $2 … placeholders, node-postgres style) on our transaction's
 * connection: node-postgres sends an object as JSON text and undefined as null, so these do too.
 */
function transactionExecutor(tx: DbTransaction): PgBoss.Db {
  const param = (value: unknown) => {
    if (value === undefined) return null
    if (value !== null && typeof value === 'object' && !(value instanceof Date)) return JSON.stringify(value)
    return value
  }
  return {
    async executeSql(text, values) {
      const parts = text.split(/\$(\d+)/)
      const chunks: SQL[] = []
      parts.forEach((part, i) => chunks.push(i % 2 === 0 ? sql.raw(part) : sql`${param(values[Number(part) - 1])}`))
      const rows = await tx.execute(sql.join(chunks))
      return { rows: [...rows] }
    },
  }
}
