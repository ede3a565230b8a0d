import { eq } from 'drizzle-orm'
import { sites } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'

/** Sets a site's raw window (days, or null to keep raw samples indefinitely); undefined for an unknown site. */
export async function setSiteRetention(tx: DbTransaction, siteId: number, rawRetentionDays: number | null) {
  const [before] = await tx.select({ code: sites.code, rawRetentionDays: sites.rawRetentionDays }).from(sites).where(eq(sites.id, siteId)).for('update')
  if (!before) return undefined
  await tx.update(sites).set({ rawRetentionDays }).where(eq(sites.id, siteId))
  return { code: before.code, before: before.rawRetentionDays, after: rawRetentionDays }
}
