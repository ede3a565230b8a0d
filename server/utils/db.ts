import postgres from 'postgres'
import { drizzle } from 'drizzle-orm/postgres-js'
import * as schema from '../db/schema'

export type Db = ReturnType<typeof createDb>

function createDb(url: string, max = Number(process.env.BRINKLINE_DB_POOL ?? 20)) {
  const client = postgres(url, {
    max,
    // Fail fast when the database is down so callers answer 503 instead of hanging.
    connect_timeout: 5,
    idle_timeout: 30,
    onnotice: () => {},
  })
  return Object.assign(drizzle(client, { schema }), { $sql: client })
}

let db: Db | undefined

/** The server's database address (the replay queue opens its own pool to it). */
export function databaseUrl(): string {
  const url = useRuntimeConfig().databaseUrl || process.env.DATABASE_URL
  if (!url) throw new Error('Database URL missing: set NUXT_DATABASE_URL')
  return url
}

/** The process-wide database handle (one pool per server instance). */
export function useDb(): Db {
  db ??= createDb(databaseUrl())
  return db
}

let ownerDb: Db | undefined

/**
 * The schema owner's handle: migrations, the grants to the app role and the storage job (which
 * makes, analyses and drops partitions, things only a table's owner may do). A pool of two of its
 * own; the app's handle when no owner address is configured (one role for everything).
 */
export function useOwnerDb(): Db {
  const url = useRuntimeConfig().migrationDatabaseUrl
  if (!url) return useDb()
  ownerDb ??= createDb(url, 2)
  return ownerDb
}

/** The role the app connects as, when it differs from the schema owner; else undefined. */
export function separateAppRole(): string | undefined {
  const ownerUrl = useRuntimeConfig().migrationDatabaseUrl
  if (!ownerUrl) return undefined
  const app = decodeURIComponent(new URL(databaseUrl()).username)
  return app && app !== decodeURIComponent(new URL(ownerUrl).username) ? app : undefined
}

/** The database or a transaction on it: query helpers that may run inside one take this. */
export type DbExecutor = Pick<Db, 'select' | 'insert' | 'update' | 'delete'>
/** The handle a `db.transaction(async tx => …)` callback receives. */
export type DbTransaction = Parameters<Parameters<Db['transaction']>[0]>[0]
