/** The SQLSTATE of a PostgreSQL error, whether drizzle wrapped it or not. */
export function sqlState(err: unknown): string | undefined {
  const e = err as { code?: string, cause?: { code?: string } }
  return e?.code ?? e?.cause?.code
}
export const UNIQUE_VIOLATION = '23505'
export const FOREIGN_KEY_VIOLATION = '23503'
