import postgres from 'postgres'
import { drizzle } from 'drizzle-orm/postgres-js'
import * as schema from '../db/schema'

export type Db = ReturnType<typeof createDb>

function createDb(url: string) {
  const client = postgres(url, {
    max: Number(process.env.BRINKLINE_DB_POOL ?? 20),
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

/** The database or a transaction on it: query helpers that may run inside one take this. */
export type DbExecutor = Pick<Db, 'select' | 'insert' | 'update' | 'delete'>
/** The handle a `db.transaction(async tx => …)` callback receives. */
export type DbTransaction = Parameters<Parameters<Db['transaction']>[0]>[0]
