import { sql, type SQL } from 'drizzle-orm'
import type { AnyPgColumn } from 'drizzle-orm/pg-core'

/** SQL for "column is one of these constants", for CHECK constraints on closed text sets. */
export function oneOf(column: AnyPgColumn, values: readonly string[]): SQL {
  const list = values.map(v => `'${v.replace(/'/g, '\'\'')}'`).join(', ')
  return sql`${column} in (${sql.raw(list)})`
}
